//! Issue 20 ("a practitioner's first hour"), item 1: the default text of `check` fits the
//! terminal. Every shipped example and three invented frames (`tests/frames/`: a 2-bay
//! 4-storey concrete frame in kN-m, a steel gable portal in kip-ft, a 3-bay 2-storey steel
//! frame with a leaning column and a pin-ended brace) go through the program: no line is
//! wider than 120 columns with `COLUMNS` unset (output that is not a terminal), none wider
//! than `COLUMNS` when it is set. Project requirements (rule 8 of the project: default text
//! output fits 120 columns), no external source.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

use plumbline::report::{column_widths, table_fitting, wrap_text};

const BIN: &str = env!("CARGO_BIN_EXE_plumbline");
const ROOT: &str = env!("CARGO_MANIFEST_DIR");

/// The model files: `examples/*.toml`, then `tests/frames/*.toml`, each sorted.
fn frames() -> Vec<PathBuf> {
    let mut all = Vec::new();
    for dir in ["examples", "tests/frames"] {
        let mut files: Vec<PathBuf> = std::fs::read_dir(Path::new(ROOT).join(dir))
            .expect("the directory exists")
            .map(|e| e.expect("a directory entry").path())
            .filter(|p| p.extension().is_some_and(|x| x == "toml"))
            .collect();
        files.sort();
        all.extend(files);
    }
    all
}

/// `plumbline check MODEL ARGS…` with `COLUMNS` set to `columns` or removed.
fn check(model: &Path, args: &[&str], columns: Option<usize>) -> Output {
    let mut cmd = Command::new(BIN);
    cmd.arg("check").arg(model).args(args).current_dir(ROOT);
    match columns {
        Some(c) => cmd.env("COLUMNS", c.to_string()),
        None => cmd.env_remove("COLUMNS"),
    };
    cmd.output().expect("the plumbline binary runs")
}

/// The lines of `text` wider than `width` (display width in terminal columns).
fn too_wide(text: &str, width: usize) -> Vec<String> {
    text.lines()
        .filter(|l| textwrap::core::display_width(l) > width)
        .map(String::from)
        .collect()
}

/// The stdout of a run that must succeed (exit 0, or 3 for a case found unstable).
fn stdout(model: &Path, args: &[&str], columns: Option<usize>) -> String {
    let o = check(model, args, columns);
    assert!(
        matches!(o.status.code(), Some(0) | Some(3)),
        "plumbline check {} failed:\n{}",
        model.display(),
        String::from_utf8_lossy(&o.stderr)
    );
    String::from_utf8(o.stdout).expect("UTF-8 output")
}

#[test]
fn there_are_seven_frames() {
    // Four shipped examples and the three invented frames of issue 20.
    let names: Vec<String> = frames()
        .iter()
        .map(|p| p.file_name().unwrap().to_string_lossy().into_owned())
        .collect();
    assert!(names.len() >= 7, "{names:?}");
    for f in [
        "concrete-2bay-4story.toml",
        "steel-gable-kipft.toml",
        "steel-3bay-leaning-brace.toml",
    ] {
        assert!(names.iter().any(|n| n == f), "{f} missing from {names:?}");
    }
}

#[test]
fn default_summary_fits_120_columns_and_columns_when_set() {
    for model in frames() {
        for columns in [None, Some(100), Some(160)] {
            let text = stdout(&model, &[], columns);
            let width = columns.unwrap_or(120);
            let wide = too_wide(&text, width);
            assert!(
                wide.is_empty(),
                "{} with COLUMNS={columns:?}: {} lines wider than {width}, e.g.\n{}",
                model.display(),
                wide.len(),
                wide[0]
            );
            assert!(
                !text.lines().any(|l| l.ends_with(' ')),
                "{}: a line ends in a space",
                model.display()
            );
        }
    }
}

#[test]
fn detail_prints_the_summary_first_then_the_detail_under_a_heading() {
    let model = Path::new(ROOT).join("examples/workshop-portal.toml");
    let text = stdout(&model, &["--detail"], Some(100));
    let source = std::fs::read_to_string(&model).expect("the example reads");
    let title = source
        .lines()
        .find_map(|l| l.strip_prefix("title = \""))
        .and_then(|t| t.split('"').next())
        .expect("the example has a title");
    assert_eq!(
        text.lines().next(),
        Some(title),
        "the model's title comes first"
    );
    let heading = text
        .find(plumbline::app::DETAIL_HEADING)
        .expect("the detail heading");
    let closing = text
        .find("Cases that never govern")
        .expect("the closing lines");
    assert!(closing < heading, "summary before the detail");
    let words = text.split_whitespace().collect::<Vec<_>>().join(" ");
    assert!(
        words.ends_with(plumbline::CAUTION),
        "the caution closes the output"
    );
    let wide = too_wide(&text, 100);
    assert!(wide.is_empty(), "--detail wider than 100: {wide:?}");
}

#[test]
fn story_envelope_shows_only_the_chosen_methods_figures() {
    // The office demo uses aisc-b1b2: B2 yes; Q, δs, α_cr no (they belong to ACI 318-19
    // 6.6.4 and EN 1993-1-1 5.2); --detail shows them all.
    let model = Path::new(ROOT).join("examples/office-3story.toml");
    let story_head = |text: &str| -> String {
        let mut lines = text
            .lines()
            .skip_while(|l| !l.starts_with("Story envelope"));
        lines.nth(1).unwrap_or_default().to_string()
    };
    let default = story_head(&stdout(&model, &[], Some(200)));
    assert!(default.contains("max B2"), "{default}");
    for other in ["max Q", "max δs", "min α_cr"] {
        assert!(!default.contains(other), "{other} in {default}");
    }
    let detail = story_head(&stdout(&model, &["--detail"], Some(400)));
    for all in ["max B2", "max Q", "max δs", "min α_cr", "max Δ2/Δ1"] {
        assert!(detail.contains(all), "{all} missing from {detail}");
    }
}

#[test]
fn legend_explains_every_suffix_in_use() {
    // The concrete frame has arranged live load (/Q:…), wind alternatives (/WL),
    // companions left out (~S); the leaning-column frame a reversed wind case (/-W) and
    // notional-load variants (/N+).
    let concrete = stdout(
        &Path::new(ROOT).join("tests/frames/concrete-2bay-4story.toml"),
        &[],
        None,
    );
    for key in ["~S ", "/WL ", "/L:p "] {
        assert!(concrete.contains(&format!("  {key}")), "legend lacks {key}");
    }
    let leaning = stdout(
        &Path::new(ROOT).join("tests/frames/steel-3bay-leaning-brace.toml"),
        &[],
        None,
    );
    assert!(
        leaning.contains("/-W "),
        "a reversed alternative is named -W"
    );
    assert!(leaning.contains("  /N+ "), "legend lacks /N+");
}

#[test]
fn a_table_too_wide_is_fitted_without_breaking_words_that_fit() {
    let header = ["member", "case", "note"];
    let rows = vec![vec![
        "C1.1".to_string(),
        "2.3.1-4b~L/WL+Su".to_string(),
        "a long remark that has to wrap onto several lines to fit".to_string(),
    ]];
    let t = table_fitting(&header, rows, 40);
    assert!(too_wide(&t, 40).is_empty(), "{t}");
    assert!(
        t.contains("2.3.1-4b~L/WL+Su"),
        "an id that fits stays whole:\n{t}"
    );
    assert!(!t.lines().any(|l| l.ends_with(' ')));
}

#[test]
fn column_widths_narrow_the_widest_first() {
    // Room for 20: the 30-wide column gives way, down to its longest word (12), then the
    // 10-wide one; words are broken only below the longest words.
    assert_eq!(
        column_widths(&[5, 10, 30], &[5, 4, 12], 100),
        vec![5, 10, 30]
    );
    assert_eq!(
        column_widths(&[5, 10, 30], &[5, 4, 12], 27),
        vec![5, 10, 12]
    );
    assert_eq!(column_widths(&[5, 10, 30], &[5, 4, 12], 21), vec![5, 4, 12]);
    assert_eq!(
        column_widths(&[5, 10, 30], &[5, 4, 12], 12)
            .iter()
            .sum::<usize>(),
        12
    );
}

#[test]
fn wrapped_lists_keep_ids_whole() {
    let list = "Cases that never govern (3 of 9): 2.3.1-4a~L~Lr/WL, 2.3.1-4a~L~Lr/WR, 6.10-1c~S/WL/Q:adj-N2.1";
    let w = wrap_text(list, 50, 2);
    assert!(too_wide(&w, 50).is_empty(), "{w}");
    for id in ["2.3.1-4a~L~Lr/WL,", "6.10-1c~S/WL/Q:adj-N2.1"] {
        assert!(w.contains(id), "{id} broken in\n{w}");
    }
}
