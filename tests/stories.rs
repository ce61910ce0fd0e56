//! Story detection on regular and irregular frames. The expected stories follow from the
//! geometry by definition (closed form); no published value is involved.

mod common;

use common::Frame;
use plumbline::input::load_model;
use plumbline::model::StoryDeclaration;
use plumbline::stories::{StoryError, member_stories, stories};
use std::path::Path;

#[test]
fn a_column_passing_a_mezzanine_level_is_rejected_with_its_id() {
    // Line 1 has a column from 0 to 6 m; line 2 stops at a mezzanine at 3 m and goes on.
    let mut f = Frame::new();
    let a0 = f.node(0.0, 0.0);
    let a2 = f.node(0.0, 6.0);
    let b0 = f.node(6.0, 0.0);
    let b1 = f.node(6.0, 3.0);
    let b2 = f.node(6.0, 6.0);
    let tall = f.member(a0, a2, 200e9, 0.01, 1e-4);
    f.member(b0, b1, 200e9, 0.01, 1e-4);
    f.member(b1, b2, 200e9, 0.01, 1e-4);
    f.member(a2, b2, 200e9, 0.01, 2e-4);
    f.fixed(a0);
    f.fixed(b0);
    let err = stories(&f.model).unwrap_err();
    match &err {
        StoryError::ColumnSpansLevel { column, level, .. } => {
            assert_eq!(column, &f.model.members[tall].id);
            assert!((level - 3.0).abs() < 1e-9);
        }
        other => panic!("expected ColumnSpansLevel, got {other:?}"),
    }
    assert!(
        err.to_string().contains("declare the story levels"),
        "{err}"
    );
    // Declaring the levels as the roof only still finds the split column line.
    f.model.stories = Some(StoryDeclaration { levels: vec![6.0] });
    let s = stories(&f.model).unwrap();
    assert_eq!(s.len(), 1);
}

#[test]
fn gable_frame_has_one_story_topped_by_the_eaves() {
    // The ridge lies above the eaves and is not a story level: one story, columns only.
    let model = load_model(Path::new("examples/gable-frame.toml")).unwrap();
    let s = stories(&model).unwrap();
    assert_eq!(s.len(), 1);
    let ridge = model.node_index("ridge").unwrap();
    assert!(!s[0].top_nodes.contains(&ridge));
    assert_eq!(s[0].top_nodes.len(), 2);
    assert_eq!(s[0].columns.len(), 2);
    // The rafters stand on the eaves level: they take story 1's sway amplifier.
    for id in ["rafter-L", "rafter-R"] {
        assert_eq!(
            member_stories(&model, &s, model.member_index(id).unwrap()),
            vec![0]
        );
    }
}

#[test]
fn generated_three_story_frame_and_member_story_membership() {
    let model = load_model(Path::new("examples/office-3story.toml")).unwrap();
    let s = stories(&model).unwrap();
    assert_eq!(s.len(), 3);
    for st in &s {
        assert_eq!(st.columns.len(), 3);
        assert_eq!(st.top_nodes.len(), 3);
    }
    // A floor beam at level 1 belongs to stories 1 and 2; a roof beam to story 3 only;
    // a first-story column to story 1.
    let b = |id: &str| model.member_index(id).unwrap();
    assert_eq!(member_stories(&model, &s, b("B1.1")), vec![0, 1]);
    assert_eq!(member_stories(&model, &s, b("B1.3")), vec![2]);
    assert_eq!(member_stories(&model, &s, b("C2.1")), vec![0]);
}
