//! Reading an input file safely: regular files only (checked on the file's metadata before any
//! byte is read), at most a size limit, and text that must be UTF-8. Case, rule and CSV readers
//! all go through [`read_text`].

use std::io::Read;
use std::path::Path;
use std::sync::atomic::{AtomicU64, Ordering};

/// Default largest input file, bytes (8 MiB: a field case with dense scans is well below 1 MiB).
pub const DEFAULT_MAX_INPUT_BYTES: u64 = 8 * 1024 * 1024;
/// Environment variable that raises (or lowers) the limit, in bytes; `--max-input-size` wins.
pub const MAX_INPUT_ENV: &str = "ROLLSLEUTH_MAX_INPUT_SIZE";

static LIMIT: AtomicU64 = AtomicU64::new(0);

/// Set the largest input file, bytes, for the rest of the run (0 restores the default).
pub fn set_max_input_bytes(bytes: u64) {
    LIMIT.store(bytes, Ordering::Relaxed);
}

/// The largest input file in force, bytes: the option, else the environment variable, else the
/// default.
pub fn max_input_bytes() -> u64 {
    match LIMIT.load(Ordering::Relaxed) {
        0 => std::env::var(MAX_INPUT_ENV)
            .ok()
            .and_then(|v| v.trim().parse::<u64>().ok())
            .filter(|&b| b > 0)
            .unwrap_or(DEFAULT_MAX_INPUT_BYTES),
        b => b,
    }
}

/// Why an input file was refused; each message says what to do.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum InputError {
    /// The file does not exist.
    #[error("does not exist, so rollsleuth cannot read it. Fix: check the path (a relative path starts from the current folder)")]
    Missing,
    /// The file exists but cannot be opened or read.
    #[error("exists but rollsleuth cannot read it ({0}). Fix: check the file's permissions, or copy it to a readable place")]
    Open(String),
    /// Not a regular file (a folder, FIFO, device or socket).
    #[error("is {0}, not a regular file. Fix: give the path of a file saved on disk")]
    NotRegular(&'static str),
    /// Larger than the limit.
    #[error("is larger than the input limit of {limit} bytes. Fix: check that this is the right file, or raise the limit with --max-input-size BYTES (or the environment variable ROLLSLEUTH_MAX_INPUT_SIZE)")]
    TooLarge {
        /// Limit in force, bytes.
        limit: u64,
    },
    /// Not UTF-8 text.
    #[error("is not UTF-8 text (first bad byte at offset {0}). Fix: save the file as UTF-8 text; a spreadsheet or word processor file must be exported as plain text first")]
    NotUtf8(usize),
}

/// The error for an I/O failure on opening or reading.
fn open_error(e: std::io::Error) -> InputError {
    match e.kind() {
        std::io::ErrorKind::NotFound => InputError::Missing,
        std::io::ErrorKind::PermissionDenied => InputError::Open("permission denied".into()),
        _ => InputError::Open(e.to_string()),
    }
}

/// What kind of non-regular file this is, in plain words.
fn kind_of(ft: &std::fs::FileType) -> &'static str {
    #[cfg(unix)]
    {
        use std::os::unix::fs::FileTypeExt;
        if ft.is_fifo() {
            return "a named pipe (FIFO)";
        }
        if ft.is_char_device() || ft.is_block_device() {
            return "a device";
        }
        if ft.is_socket() {
            return "a socket";
        }
    }
    if ft.is_dir() {
        "a folder"
    } else {
        "not a file"
    }
}

/// Check that `path` is a regular file (following a symlink to its target) without opening it.
pub fn check_regular(path: &Path) -> Result<u64, InputError> {
    let meta = std::fs::metadata(path).map_err(open_error)?;
    if !meta.file_type().is_file() {
        return Err(InputError::NotRegular(kind_of(&meta.file_type())));
    }
    Ok(meta.len())
}

/// Read at most the input limit of bytes from a regular file.
pub fn read_bytes(path: &Path) -> Result<Vec<u8>, InputError> {
    let limit = max_input_bytes();
    let len = check_regular(path)?;
    if len > limit {
        return Err(InputError::TooLarge { limit });
    }
    let file = std::fs::File::open(path).map_err(open_error)?;
    // the file may have changed since the metadata was read: the read itself is bounded too
    let mut buf = Vec::with_capacity(len as usize);
    file.take(limit + 1)
        .read_to_end(&mut buf)
        .map_err(open_error)?;
    if buf.len() as u64 > limit {
        return Err(InputError::TooLarge { limit });
    }
    Ok(buf)
}

/// Read a regular file of at most the input limit as UTF-8 text (a leading byte-order mark is
/// dropped).
pub fn read_text(path: &Path) -> Result<String, InputError> {
    let bytes = read_bytes(path)?;
    let mut text =
        String::from_utf8(bytes).map_err(|e| InputError::NotUtf8(e.utf8_error().valid_up_to()))?;
    if text.starts_with('\u{feff}') {
        text.drain(..3);
    }
    Ok(text)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn devices_and_folders_are_refused_before_reading() {
        assert_eq!(
            read_bytes(Path::new("/dev/zero")),
            Err(InputError::NotRegular("a device"))
        );
        assert_eq!(
            read_bytes(Path::new("/")),
            Err(InputError::NotRegular("a folder"))
        );
    }

    #[test]
    fn non_utf8_text_names_the_offset() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("latin1.yaml");
        std::fs::write(&p, b"name: caf\xe9\n").unwrap();
        assert_eq!(read_text(&p), Err(InputError::NotUtf8(9)));
    }
}
