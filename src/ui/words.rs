//! Words that agree with their numbers, shared by the panels and windows.

/// "1 clash", "3 clashes": `n` and the noun in its number.
pub fn count(n: usize, one: &str, many: &str) -> String {
    format!("{n} {}", if n == 1 { one } else { many })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn counts_agree_with_their_nouns() {
        assert_eq!(count(1, "clash", "clashes"), "1 clash");
        assert_eq!(count(0, "clash", "clashes"), "0 clashes");
        assert_eq!(count(12, "land region", "land regions"), "12 land regions");
    }
}
