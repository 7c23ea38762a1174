//! The line of every field in a case text, by field path (`storage[1].duration`), so that a
//! case edited by `--set` still reports problems at the lines of the file the user wrote.

use serde::de::{self, Deserialize, Deserializer, MapAccess, SeqAccess, Visitor};
use serde_saphyr::Spanned;
use std::collections::BTreeMap;
use std::fmt;

/// A YAML node with the location of every child.
enum Node {
    Map(Vec<(String, Spanned<Node>)>),
    Seq(Vec<Spanned<Node>>),
    Leaf,
}

/// A mapping key of any scalar type, as text.
struct Key(String);

impl<'de> Deserialize<'de> for Key {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl Visitor<'_> for V {
            type Value = Key;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("a scalar key")
            }
            fn visit_str<E: de::Error>(self, v: &str) -> Result<Key, E> {
                Ok(Key(v.to_string()))
            }
            fn visit_i64<E: de::Error>(self, v: i64) -> Result<Key, E> {
                Ok(Key(v.to_string()))
            }
            fn visit_u64<E: de::Error>(self, v: u64) -> Result<Key, E> {
                Ok(Key(v.to_string()))
            }
            fn visit_f64<E: de::Error>(self, v: f64) -> Result<Key, E> {
                Ok(Key(v.to_string()))
            }
            fn visit_bool<E: de::Error>(self, v: bool) -> Result<Key, E> {
                Ok(Key(v.to_string()))
            }
        }
        d.deserialize_any(V)
    }
}

impl<'de> Deserialize<'de> for Node {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = Node;
            fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
                f.write_str("a YAML value")
            }
            fn visit_map<A: MapAccess<'de>>(self, mut m: A) -> Result<Node, A::Error> {
                let mut v = Vec::new();
                while let Some(Key(k)) = m.next_key::<Key>()? {
                    v.push((k, m.next_value::<Spanned<Node>>()?));
                }
                Ok(Node::Map(v))
            }
            fn visit_seq<A: SeqAccess<'de>>(self, mut s: A) -> Result<Node, A::Error> {
                let mut v = Vec::new();
                while let Some(x) = s.next_element::<Spanned<Node>>()? {
                    v.push(x);
                }
                Ok(Node::Seq(v))
            }
            fn visit_bool<E: de::Error>(self, _: bool) -> Result<Node, E> {
                Ok(Node::Leaf)
            }
            fn visit_i64<E: de::Error>(self, _: i64) -> Result<Node, E> {
                Ok(Node::Leaf)
            }
            fn visit_u64<E: de::Error>(self, _: u64) -> Result<Node, E> {
                Ok(Node::Leaf)
            }
            fn visit_f64<E: de::Error>(self, _: f64) -> Result<Node, E> {
                Ok(Node::Leaf)
            }
            fn visit_str<E: de::Error>(self, _: &str) -> Result<Node, E> {
                Ok(Node::Leaf)
            }
            fn visit_unit<E: de::Error>(self) -> Result<Node, E> {
                Ok(Node::Leaf)
            }
            fn visit_none<E: de::Error>(self) -> Result<Node, E> {
                Ok(Node::Leaf)
            }
        }
        d.deserialize_any(V)
    }
}

/// Field path -> 1-based line, for every field of a case text (empty when the text does not
/// parse: its syntax error is reported elsewhere).
pub(super) fn field_lines(text: &str) -> BTreeMap<String, u64> {
    let mut out = BTreeMap::new();
    if let Ok(root) = serde_saphyr::from_str::<Node>(text) {
        walk("", &root, &mut out);
    }
    out
}

fn walk(prefix: &str, node: &Node, out: &mut BTreeMap<String, u64>) {
    match node {
        Node::Map(entries) => {
            for (k, v) in entries {
                let path = if prefix.is_empty() {
                    k.clone()
                } else {
                    format!("{prefix}.{k}")
                };
                out.insert(path.clone(), v.referenced.line());
                walk(&path, &v.value, out);
            }
        }
        Node::Seq(items) => {
            for (i, v) in items.iter().enumerate() {
                let path = format!("{prefix}[{i}]");
                out.insert(path.clone(), v.referenced.line());
                walk(&path, &v.value, out);
            }
        }
        Node::Leaf => {}
    }
}

/// The line of `field`, or of its nearest enclosing field that has one.
pub(super) fn line_for(lines: &BTreeMap<String, u64>, field: &str) -> Option<u64> {
    let mut f = field;
    loop {
        if let Some(&l) = lines.get(f) {
            return Some(l).filter(|&l| l > 0);
        }
        let cut = f.rfind(['.', '['])?;
        f = &f[..cut];
    }
}

/// Whether `field` lies at or under the field path `set` (`winding` covers `winding.nip`,
/// `storage[1]` covers `storage[1].rh`, `storage` covers `storage[1].rh`).
pub(super) fn is_under(field: &str, set: &str) -> bool {
    field == set
        || field
            .strip_prefix(set)
            .is_some_and(|rest| rest.starts_with('.') || rest.starts_with('['))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_field_has_its_line() {
        let text = "case: A\nroll:\n  width: \"1 m\"\nstorage:\n  - { duration: \"3 d\" }\n  - duration: \"4 d\"\n    rh: \"50 %\"\n";
        let l = field_lines(text);
        assert_eq!(l.get("case"), Some(&1));
        assert_eq!(l.get("roll.width"), Some(&3));
        assert_eq!(l.get("storage[0].duration"), Some(&5));
        assert_eq!(l.get("storage[1].rh"), Some(&7));
        assert_eq!(line_for(&l, "storage[1].rh.extra[2]"), Some(7));
        assert_eq!(line_for(&l, "nothing"), None);
    }

    #[test]
    fn set_paths_cover_their_children_only() {
        assert!(is_under("winding.nip", "winding"));
        assert!(is_under("storage[1].rh", "storage"));
        assert!(is_under("storage[1].rh", "storage[1]"));
        assert!(!is_under("storage[10].rh", "storage[1]"));
        assert!(!is_under("windings", "winding"));
    }
}
