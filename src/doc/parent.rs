//! Parent units: where a region's parent (a county's state, a district's province) is written
//! among its attributes, for colours that follow a hierarchy.

use super::model::AttrValue;

/// The attribute that [`ParentKey`] reads by default, and that `tinct import --parent-field`
/// writes.
pub const PARENT_ATTRIBUTE: &str = "parent";

/// Where a region's parent unit is written: an attribute, or its first `prefix` characters.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ParentKey {
    pub field: String,
    pub prefix: Option<usize>,
}

impl ParentKey {
    /// Reads "STATE" or "GEOID:2" (the first two characters of GEOID).
    pub fn parse(text: &str) -> Result<ParentKey, String> {
        let (field, prefix) = match text.rsplit_once(':') {
            Some((f, n)) => {
                let n: usize = n.trim().parse().map_err(|_| {
                    format!("{n:?} is not a number of leading characters (as in GEOID:2)")
                })?;
                if n == 0 {
                    return Err("the number of leading characters must be at least 1".into());
                }
                (f, Some(n))
            }
            None => (text, None),
        };
        let field = field.trim();
        if field.is_empty() {
            return Err("name the attribute that holds the parent unit (such as STATE)".into());
        }
        Ok(ParentKey {
            field: field.to_string(),
            prefix,
        })
    }

    /// The parent unit named by `value`, if it names one.
    pub fn parent_of(&self, value: &AttrValue) -> Option<String> {
        match value {
            AttrValue::Null => None,
            AttrValue::Bool(b) => self.cut(&b.to_string()),
            AttrValue::Number(n) if n.fract() == 0.0 && n.abs() < 1e15 => {
                self.cut(&format!("{}", *n as i64))
            }
            AttrValue::Number(n) => self.cut(&n.to_string()),
            AttrValue::Text(t) => self.cut(t),
        }
    }

    /// The parent unit named by the text of a value: trimmed, and cut to the leading
    /// characters when asked; `None` when empty.
    pub fn cut(&self, text: &str) -> Option<String> {
        let text = text.trim();
        if text.is_empty() {
            return None;
        }
        Some(match self.prefix {
            Some(n) => text.chars().take(n).collect(),
            None => text.to_string(),
        })
    }
}

impl std::fmt::Display for ParentKey {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self.prefix {
            Some(n) => write!(f, "{}:{n}", self.field),
            None => f.write_str(&self.field),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn keys_read_a_field_or_its_leading_characters() {
        let k = ParentKey::parse("GEOID:2").unwrap();
        assert_eq!((k.field.as_str(), k.prefix), ("GEOID", Some(2)));
        assert_eq!(k.cut("49035").as_deref(), Some("49"));
        assert_eq!(
            k.parent_of(&AttrValue::Number(49035.0)).as_deref(),
            Some("49")
        );
        assert_eq!(k.to_string(), "GEOID:2");
        let whole = ParentKey::parse("STATE").unwrap();
        assert_eq!(
            whole
                .parent_of(&AttrValue::Text(" Utah ".into()))
                .as_deref(),
            Some("Utah")
        );
        assert_eq!(whole.parent_of(&AttrValue::Null), None);
        assert_eq!(whole.cut("  "), None);
        assert!(ParentKey::parse("GEOID:x").is_err());
        assert!(ParentKey::parse("GEOID:0").is_err());
        assert!(ParentKey::parse(" :2").is_err());
    }
}
