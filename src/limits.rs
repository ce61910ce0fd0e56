//! Documented limits on the size of what plumbline reads, so that no input can make it run
//! for minutes or exhaust memory before answering. Each limit is refused with a message
//! that names it. The figures are generous for building frames (a 20-bay, 100-story frame
//! has 4,100 members) and keep a run within seconds: the check of 4,100 members takes about
//! 3 s (see docs/limitations.md).

/// Largest model file or combination table read, in bytes (16 MiB).
pub const MAX_FILE_BYTES: usize = 16 << 20;

/// Most nodes in a model, generated and explicit together.
pub const MAX_NODES: usize = 5_000;

/// Most members in a model, generated and explicit together.
pub const MAX_MEMBERS: usize = 5_000;

/// Most load cases in a model.
pub const MAX_LOAD_CASES: usize = 200;

/// `"{count} {what}, over the limit of {limit} ({name})"` when `count` exceeds `limit`,
/// else `None`; `name` is the limit's name in the docs.
pub fn exceeded(what: &str, count: usize, limit: usize, name: &str) -> Option<String> {
    (count > limit).then(|| format!("{count} {what}, over the limit of {limit} ({name})"))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_message_names_the_limit() {
        assert_eq!(exceeded("nodes", 5_000, MAX_NODES, "MAX_NODES"), None);
        let m = exceeded("nodes", 5_001, MAX_NODES, "MAX_NODES").unwrap();
        assert_eq!(m, "5001 nodes, over the limit of 5000 (MAX_NODES)");
    }
}
