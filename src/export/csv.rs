//! CSV export: one row per region, quoted per RFC 4180 (fields with commas, quotes or line breaks
//! in double quotes, quotes doubled; lines end with CRLF).
//!
//! Columns: `id` (Tinct's region id), `name`, `colour` (the palette slot, 0-based as in project
//! files; empty when uncoloured), `fill` (`#rrggbb`, empty when uncoloured or the slot is missing),
//! `group` (the same-colour group's name), `pinned` (`true` when the region's colour is fixed),
//! `role` (`land` or `water`).

use crate::doc::Document;

/// The CSV header, in column order.
pub const HEADER: [&str; 7] = ["id", "name", "colour", "fill", "group", "pinned", "role"];

/// One field, quoted when RFC 4180 requires it.
pub fn field(text: &str) -> String {
    if text.contains([',', '"', '\r', '\n']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.to_string()
    }
}

/// The whole table as text.
pub fn to_csv(doc: &Document) -> String {
    let mut out = HEADER.join(",");
    out.push_str("\r\n");
    for (id, region) in doc.regions() {
        let slot = doc.colouring().get(id).copied();
        let fill = slot
            .and_then(|s| doc.palette().slots.get(s as usize))
            .map(|s| s.colour.to_hex())
            .unwrap_or_default();
        let group = region
            .group
            .and_then(|g| doc.groups().get(&g))
            .map(|g| g.name.clone())
            .unwrap_or_default();
        let row = [
            id.to_string(),
            region.name.clone(),
            slot.map(|s| s.to_string()).unwrap_or_default(),
            fill,
            group,
            region.pin.is_some().to_string(),
            region.role.as_str().to_string(),
        ];
        let row: Vec<String> = row.iter().map(|f| field(f)).collect();
        out.push_str(&row.join(","));
        out.push_str("\r\n");
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn quotes_only_when_needed() {
        // RFC 4180, section 2, rules 6 and 7.
        assert_eq!(field("plain"), "plain");
        assert_eq!(field("a,b"), "\"a,b\"");
        assert_eq!(field("say \"hi\""), "\"say \"\"hi\"\"\"");
        assert_eq!(field("two\nlines"), "\"two\nlines\"");
    }
}
