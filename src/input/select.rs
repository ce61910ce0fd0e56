//! Id patterns for selecting several members or nodes in a load: `*` stands for any run of
//! characters (possibly empty), every other character matches itself, and the pattern must
//! match the whole id. `"B*.2"` selects the beams of level 2 of a generated frame, `"B*"`
//! every generated beam, `"C1.*"` the columns on grid line 1.

/// Whether `id` matches `pattern` (see the module doc).
pub fn matches(pattern: &str, id: &str) -> bool {
    let parts: Vec<&str> = pattern.split('*').collect();
    if parts.len() == 1 {
        return pattern == id;
    }
    let (first, last) = (parts[0], parts[parts.len() - 1]);
    if !id.starts_with(first) || id.len() < first.len() + last.len() || !id.ends_with(last) {
        return false;
    }
    // Greedy left-to-right search of the middle pieces in the remaining text.
    let mut rest = &id[first.len()..id.len() - last.len()];
    for piece in &parts[1..parts.len() - 1] {
        match rest.find(piece) {
            Some(k) => rest = &rest[k + piece.len()..],
            None => return false,
        }
    }
    true
}

/// Whether `pattern` contains a wildcard.
pub fn is_pattern(pattern: &str) -> bool {
    pattern.contains('*')
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn level_pattern_selects_only_that_level() {
        assert!(matches("B*.2", "B1.2"));
        assert!(matches("B*.2", "B12.2"));
        assert!(!matches("B*.2", "B1.12"));
        assert!(!matches("B*.2", "C1.2"));
        assert!(matches("B*", "B3.1"));
        assert!(matches("*", "anything"));
        assert!(matches("C1.*", "C1.3"));
        assert!(!matches("C1.*", "C11.3"));
        assert!(matches("R1", "R1"));
        assert!(!matches("R1", "R10"));
        assert!(matches("a*b*c", "abc"));
        assert!(!matches("a*b*c", "acb"));
        assert!(!matches("ab*ba", "aba"));
    }
}
