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

/// The limit [`MAX_INPUT_ENV`] sets, bytes: `None` when it is unset or empty, an error (with the
/// fix) when it is not a whole number of bytes above zero.
pub fn limit_from_env() -> Result<Option<u64>, String> {
    let Some(v) = std::env::var_os(MAX_INPUT_ENV) else {
        return Ok(None);
    };
    let text = v.to_string_lossy();
    if text.trim().is_empty() {
        return Ok(None);
    }
    match parse_size(&text) {
        Some(b) => Ok(Some(b)),
        None => Err(format!(
            "{MAX_INPUT_ENV}={text:?} is not a size in bytes above zero. Fix: set it to a whole number of bytes, e.g. {MAX_INPUT_ENV}=16777216 for 16 MiB, or unset it for the default {DEFAULT_MAX_INPUT_BYTES}"
        )),
    }
}

/// A size limit as written (option or environment): a whole number of bytes above zero.
pub fn parse_size(text: &str) -> Option<u64> {
    text.trim().parse::<u64>().ok().filter(|&b| b > 0)
}

/// The largest input file in force, bytes: the option, else the environment variable, else the
/// default (a library caller's bad variable falls back to it; the command line refuses one,
/// [`limit_from_env`]).
pub fn max_input_bytes() -> u64 {
    match LIMIT.load(Ordering::Relaxed) {
        0 => limit_from_env()
            .ok()
            .flatten()
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
    /// A stream (standard input) that failed while being read.
    #[error("could not be read ({0}). Fix: check the command that feeds it, or give a file")]
    Stream(String),
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

/// Read a stream (standard input) of at most the input limit as UTF-8 text, as [`read_text`].
pub fn read_stream(stream: impl Read) -> Result<String, InputError> {
    let limit = max_input_bytes();
    let mut buf = Vec::new();
    stream
        .take(limit + 1)
        .read_to_end(&mut buf)
        .map_err(|e| InputError::Stream(e.to_string()))?;
    if buf.len() as u64 > limit {
        return Err(InputError::TooLarge { limit });
    }
    text_of(buf)
}

/// Read a regular file of at most the input limit as UTF-8 text (a leading byte-order mark is
/// dropped).
pub fn read_text(path: &Path) -> Result<String, InputError> {
    text_of(read_bytes(path)?)
}

/// Bytes as UTF-8 text without a leading byte-order mark.
fn text_of(bytes: Vec<u8>) -> Result<String, InputError> {
    let mut text =
        String::from_utf8(bytes).map_err(|e| InputError::NotUtf8(e.utf8_error().valid_up_to()))?;
    if text.starts_with('\u{feff}') {
        text.drain(..3);
    }
    Ok(text)
}

/// A YAML parser's message in our words: the parser's advice to its programmer (option names,
/// function names, Rust integer types) replaced by what the user can do.
pub fn plain_yaml_message(message: &str) -> String {
    let mut m = message.to_string();
    for (from, to) in [
        (
            ", set DuplicateKeyPolicy in Options if acceptable",
            " (each field may appear only once; remove or merge the repeated line)",
        ),
        (
            "set DuplicateKeyPolicy in Options if acceptable",
            "each field may appear only once",
        ),
        (
            "use from_str_multiple",
            "the file holds more than one YAML document (separated by '---'); keep one",
        ),
        (
            "invalid u32",
            "not a whole number (write a plain whole number, no unit)",
        ),
        (
            "invalid u64",
            "not a whole number (write a plain whole number, no unit)",
        ),
        (
            "invalid usize",
            "not a whole number (write a plain whole number, no unit)",
        ),
        (
            "invalid i64",
            "not a whole number (write a plain whole number, no unit)",
        ),
        ("invalid f64", "not a number"),
    ] {
        m = m.replace(from, to);
    }
    if let Some(i) = m.find("budget breached") {
        let end = m[i..].find('\n').map_or(m.len(), |e| i + e);
        m.replace_range(
            i..end,
            "the YAML expands past the size limit (too many aliases, nodes or nesting levels); write the values out plainly",
        );
    }
    m
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
    fn a_stream_obeys_the_size_limit() {
        let limit = max_input_bytes() as usize;
        let big = vec![b'#'; limit + 1];
        assert_eq!(
            read_stream(&big[..]),
            Err(InputError::TooLarge {
                limit: limit as u64
            })
        );
        assert_eq!(read_stream(&b"\xef\xbb\xbfa: 1\n"[..]).unwrap(), "a: 1\n");
    }

    #[test]
    fn non_utf8_text_names_the_offset() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("latin1.yaml");
        std::fs::write(&p, b"name: caf\xe9\n").unwrap();
        assert_eq!(read_text(&p), Err(InputError::NotUtf8(9)));
    }
}
