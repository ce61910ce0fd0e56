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

#[test]
fn si_section_values_under_a_preset_warn_of_implausible_displacement() {
    // Issue 7 item 9: under `kN-m` bare section numbers are mm² and mm⁴, so A = 0.01125 and
    // I = 0.0001826 typed in SI make the sections 10⁶ and 10¹² times too small; the
    // portal then moves metres under its own weight. A translation above a tenth of the
    // frame's height is implausible (common practice, no source) and is named with the
    // units hint, while the run still completes.
    let text = portal()
        .replace(
            "A = \"112.5 cm^2\"\nI = \"18260 cm^4\"",
            "A = 0.01125\nI = 0.0001826",
        )
        .replace(
            "A = \"98.8 cm^2\"\nI = \"33740 cm^4\"",
            "A = 0.00988\nI = 0.0003374",
        );
    let dir = std::env::temp_dir().join(format!("plumbline-checks-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("si.toml");
    std::fs::write(&path, &text).unwrap();
    let out = plumbline::app::check(&path, &plumbline::app::CheckArgs::default()).unwrap();
    assert!(
        out.contains("Warning: load case G: node") && out.contains("sections in mm"),
        "{out}"
    );
    // The example itself, in consistent units, draws no warning.
    let ok = plumbline::app::check(
        &Path::new(ROOT).join("examples/workshop-portal.toml"),
        &plumbline::app::CheckArgs::default(),
    )
    .unwrap();
    assert!(!ok.contains("Warning:"));
}
