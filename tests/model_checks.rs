//! Model checks of issue 7 item 10 and plausibility of item 9: each bad model is refused
//! with the file, line and field of the offending value, naming what is wrong. These are
//! the program's input contract (issue 7, no external source).

use std::path::Path;

use plumbline::input::parse_model;

const ROOT: &str = env!("CARGO_MANIFEST_DIR");

fn portal() -> String {
    std::fs::read_to_string(Path::new(ROOT).join("examples/workshop-portal.toml")).unwrap()
}

/// The 1-based line of the first occurrence of `needle` in `text`.
fn line_of(text: &str, needle: &str) -> usize {
    text[..text.find(needle).expect("needle in text")]
        .lines()
        .count()
        + 1
}

#[test]
fn a_node_far_away_is_reported_as_itself() {
    // A node at 1e308 m once made two other nodes "coincide" under the relative length
    // tolerance; now the node itself is named.
    let text = portal().replacen("id = \"C\"\nx = 12\n", "id = \"C\"\nx = 1e308\n", 1);
    let e = parse_model(&text, "far.toml").unwrap_err();
    assert_eq!(e.line, line_of(&text, "id = \"C\""));
    assert!(
        e.message.contains("node \"C\"") && e.message.contains("1e308"),
        "{e}"
    );
}

#[test]
fn two_nodes_at_one_point_with_members_are_refused() {
    // The right column framing into a second node "C2" at the point of "C" would split
    // the frame in two there.
    let text = portal()
        .replacen(
            "[[node]]\nid = \"D\"",
            "[[node]]\nid = \"C2\"\nx = 12\ny = 5\n\n[[node]]\nid = \"D\"",
            1,
        )
        .replacen("i = \"D\"\nj = \"C\"", "i = \"D\"\nj = \"C2\"", 1);
    let e = parse_model(&text, "dup.toml").unwrap_err();
    assert_eq!(e.line, line_of(&text, "id = \"C2\""));
    assert!(
        e.message.contains("\"C\" and \"C2\"") && e.message.contains("same point"),
        "{e}"
    );
}

#[test]
fn story_levels_must_meet_column_ends() {
    // The portal's columns end at 0 m and 5 m: a declared level at 4.5 m (or at 1e308)
    // meets no column.
    for level in ["4.5", "1e308"] {
        let text = format!("{}\n[analysis]\nstory_levels = [{level}]\n", portal());
        let e = parse_model(&text, "levels.toml").unwrap_err();
        assert_eq!(e.field, "analysis.story_levels[1]");
        assert_eq!(e.line, line_of(&text, "story_levels"));
        assert!(e.message.contains("no column starts or ends"), "{e}");
    }
    let ok = format!("{}\n[analysis]\nstory_levels = [5]\n", portal());
    parse_model(&ok, "levels.toml").unwrap();
}
