//! The `--set path=value` editor: overrides applied to the case as a generic YAML tree before
//! the typed schema reads it.

use super::errors::CaseError;

/// Apply every `--set` override to the case text; returns the edited case as JSON text (JSON is
/// YAML, so the typed schema reads it back). Lines of the original file are lost on the way.
pub(super) fn edited_text(text: &str, file: &str, sets: &[String]) -> Result<String, CaseError> {
    let mut tree: serde_json::Value =
        serde_saphyr::from_str(text).map_err(|e| CaseError::Syntax {
            file: file.to_string(),
            message: e.to_string(),
        })?;
    for s in sets {
        apply_set(&mut tree, s)?;
    }
    serde_json::to_string(&tree).map_err(|e| CaseError::Set {
        arg: sets.join(" "),
        message: e.to_string(),
    })
}

/// Apply one `path=value` override to a YAML tree. Missing maps on the path are created;
/// list indices are written `name[3]`.
pub fn apply_set(tree: &mut serde_json::Value, arg: &str) -> Result<(), CaseError> {
    let err = |m: &str| CaseError::Set {
        arg: arg.to_string(),
        message: m.to_string(),
    };
    let (path, value) = arg
        .split_once('=')
        .ok_or_else(|| err("no '=' between the field path and the value"))?;
    let path = path.trim();
    if path.is_empty() {
        return Err(err("empty field path"));
    }
    let parsed: serde_json::Value = serde_saphyr::from_str(value.trim())
        .unwrap_or_else(|_| serde_json::Value::String(value.trim().to_string()));
    let mut node = tree;
    let segs: Vec<&str> = path.split('.').collect();
    for (si, seg) in segs.iter().enumerate() {
        let (name, idx) = match seg.find('[') {
            Some(b) => {
                let close = seg
                    .rfind(']')
                    .filter(|&c| c > b)
                    .ok_or_else(|| err("unclosed '[' in the field path"))?;
                let i: usize = seg[b + 1..close]
                    .parse()
                    .map_err(|_| err("list index must be a whole number"))?;
                (&seg[..b], Some(i))
            }
            None => (*seg, None),
        };
        if name.is_empty() {
            return Err(err("empty name in the field path"));
        }
        let last = si + 1 == segs.len();
        let obj = node
            .as_object_mut()
            .ok_or_else(|| err(&format!("'{name}' is inside a value that is not a map")))?;
        if last && idx.is_none() {
            obj.insert(name.to_string(), parsed);
            return Ok(());
        }
        let child = obj
            .entry(name.to_string())
            .or_insert_with(|| serde_json::Value::Object(Default::default()));
        node = match idx {
            Some(i) => {
                let arr = child
                    .as_array_mut()
                    .ok_or_else(|| err(&format!("'{name}' is not a list")))?;
                let len = arr.len();
                let slot = arr.get_mut(i).ok_or_else(|| {
                    err(&format!(
                        "'{name}' has {len} entries, index {i} is past the end"
                    ))
                })?;
                if last {
                    *slot = parsed;
                    return Ok(());
                }
                slot
            }
            None => child,
        };
    }
    Ok(())
}
