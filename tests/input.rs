//! Model file reading: shipped examples, the frame generator, quantity strings and every
//! validation error with its line number.

use plumbline::input::{load_model, parse_model};
use plumbline::model::{LoadDirection, Measure, MemberLoadKind, Restraint, Role};
use std::path::Path;

fn example(name: &str) -> plumbline::model::Model {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("examples").join(name);
    load_model(&path).unwrap_or_else(|e| panic!("{name}: {e}"))
}

#[test]
fn every_example_parses() {
    for name in ["workshop-portal.toml", "retail-2story.toml", "gable-frame.toml", "office-3story.toml"] {
        let m = example(name);
        assert!(!m.load_cases.is_empty(), "{name}");
        assert!(m.combos.table.is_some(), "{name}");
    }
}
