//! Story detection on regular and irregular frames. The expected stories follow from the
//! geometry by definition (closed form); no published value is involved.

mod common;

use common::{Frame, verify};
use plumbline::input::load_model;
use plumbline::model::StoryDeclaration;
use plumbline::stories::{StoryError, member_stories, stories};
use std::path::Path;

/// Story indices as the stories are numbered in reports (from 1 at the bottom).
fn numbered(indices: Vec<usize>) -> Vec<usize> {
    indices.into_iter().map(|k| k + 1).collect()
}

#[test]
fn a_column_passing_a_mezzanine_level_is_rejected_with_its_id() {
    verify::source("closed form: the stories follow from the geometry by definition");
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
            // Relative to the level, the former absolute 1e-9 m rounded down to a power of ten.
            verify::close("level the tall column passes", "m", *level, 3.0, 1e-10);
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
    verify::same(
        "stories with the roof declared as the only level",
        1,
        s.len(),
    );
}

#[test]
fn gable_frame_has_one_story_topped_by_the_eaves() {
    // The ridge lies above the eaves and is not a story level: one story, columns only.
    verify::source("closed form: the stories follow from the geometry by definition");
    let model = load_model(Path::new("examples/gable-frame.toml")).unwrap();
    let s = stories(&model).unwrap();
    verify::same("gable frame: stories", 1, s.len());
    let ridge = model.node_index("ridge").unwrap();
    verify::same(
        "gable frame: the ridge is a story top",
        false,
        s[0].top_nodes.contains(&ridge),
    );
    verify::same("gable frame: top nodes of story 1", 2, s[0].top_nodes.len());
    verify::same("gable frame: columns of story 1", 2, s[0].columns.len());
    // The rafters stand on the eaves level: they take story 1's sway amplifier.
    for id in ["rafter-L", "rafter-R"] {
        verify::same(
            &format!("gable frame: stories of {id}"),
            vec![1],
            numbered(member_stories(&model, &s, model.member_index(id).unwrap())),
        );
    }
}

#[test]
fn generated_three_story_frame_and_member_story_membership() {
    verify::source("closed form: the stories follow from the geometry by definition");
    let model = load_model(Path::new("examples/office-3story.toml")).unwrap();
    let s = stories(&model).unwrap();
    verify::same("office frame: stories", 3, s.len());
    for (k, st) in s.iter().enumerate() {
        verify::same(
            &format!("office frame: columns of story {}", k + 1),
            3,
            st.columns.len(),
        );
        verify::same(
            &format!("office frame: top nodes of story {}", k + 1),
            3,
            st.top_nodes.len(),
        );
    }
    // A floor beam at level 1 belongs to stories 1 and 2; a roof beam to story 3 only;
    // a first-story column to story 1.
    let b = |id: &str| model.member_index(id).unwrap();
    for (id, expected) in [("B1.1", vec![1, 2]), ("B1.3", vec![3]), ("C2.1", vec![1])] {
        verify::same(
            &format!("office frame: stories of {id}"),
            expected,
            numbered(member_stories(&model, &s, b(id))),
        );
    }
}
