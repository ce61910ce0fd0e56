//! The `plumbline` program as a user runs it: exit status, what it prints, JSON keys,
//! errors located in the file, and the all-or-nothing `--output` file.
//!
//! The engineering figures are tested in the library tests; here the checks are the
//! command-line contract of issues #2 and #4 (project requirements, no external source),
//! except the equilibrium residual, whose bound 1e-9 is the acceptance criterion of
//! issue #2 (equilibrium of applied loads and reactions: statics, closed form).

mod common;

use common::examples;
use common::verify;
use std::path::{Path, PathBuf};
use std::process::{Command, Output, Stdio};

const BIN: &str = env!("CARGO_BIN_EXE_plumbline");
const ROOT: &str = env!("CARGO_MANIFEST_DIR");

/// Run the program with `args` from the crate root.
fn run(args: &[&str]) -> Output {
    Command::new(BIN)
        .args(args)
        .current_dir(ROOT)
        .output()
        .expect("the plumbline binary runs")
}

fn stdout(o: &Output) -> String {
    String::from_utf8_lossy(&o.stdout).into_owned()
}

fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

/// Assert success and return stdout.
fn ok(args: &[&str]) -> String {
    let o = run(args);
    assert!(
        o.status.success(),
        "plumbline {args:?} failed:\n{}",
        stderr(&o)
    );
    stdout(&o)
}

/// Assert a clean failure (non-zero exit, no panic) and return stderr on one line (the
/// diagnostic's box-drawing margin removed and its wrapped lines joined).
fn fails(args: &[&str]) -> String {
    let o = run(args);
    let err = stderr(&o);
    assert!(!o.status.success(), "plumbline {args:?} should fail");
    assert!(
        !err.contains("panicked"),
        "plumbline {args:?} panicked:\n{err}"
    );
    assert!(!err.trim().is_empty(), "plumbline {args:?}: no message");
    err.replace('│', " ")
        .split_whitespace()
        .collect::<Vec<_>>()
        .join(" ")
}

/// A fresh scratch directory for one test.
fn scratch(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("plumbline-cli-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

const OFFICE: &str = "examples/office-3story.toml";

#[test]
fn check_prints_every_story_and_the_caution() {
    // Wide enough that every case's story table is one table (issue 20: narrower output
    // prints it in parts).
    let o = Command::new(BIN)
        .args(["check", OFFICE, "--detail"])
        .env("COLUMNS", "400")
        .current_dir(ROOT)
        .output()
        .expect("the plumbline binary runs");
    assert!(o.status.success(), "{}", stderr(&o));
    let out = stdout(&o);
    // Three stories, each in the story list and in every case's story table.
    let model = plumbline::input::load_model(&Path::new(ROOT).join(OFFICE)).unwrap();
    let stories = plumbline::stories::stories(&model).unwrap();
    assert_eq!(stories.len(), 3);
    for s in &stories {
        for c in &s.columns {
            assert!(
                out.contains(&model.members[*c].id),
                "column {}",
                model.members[*c].id
            );
        }
    }
    assert!(out.contains("Stories"));
    // Every case has a story table with one row per story, each row with its verdict and
    // the criterion that decided it (AISC 360-16 App. 8 method: "B2 = ...").
    let cases = out.lines().filter(|l| l.starts_with("Case ")).count();
    assert!(cases >= 18, "{cases} cases");
    let rows = out
        .lines()
        .filter(|l| l.contains("sway") && l.contains("B2 = "))
        .count();
    assert_eq!(rows, 3 * cases);
    // Rule 4 of the project: results assist a licensed engineer; local codes govern.
    assert!(out.contains("licensed engineer"), "caution missing");
    assert!(out.contains("governs"));
}

#[test]
fn check_json_has_the_documented_keys() {
    let out = ok(&["check", OFFICE, "--format", "json"]);
    let v: serde_json::Value = serde_json::from_str(&out).expect("valid JSON");
    for key in ["title", "units", "report", "caution"] {
        assert!(v.get(key).is_some(), "key {key} missing");
    }
    assert!(v["caution"].as_str().unwrap().contains("licensed engineer"));
    let cases = v["report"]["cases"].as_array().unwrap();
    assert!(!cases.is_empty());
    for c in cases {
        assert_eq!(c["stories"].as_array().unwrap().len(), 3, "{}", c["id"]);
        assert!(c["stable"].as_bool().unwrap(), "{}", c["id"]);
        assert!(c["members"].as_array().unwrap().len() >= 15);
    }
    assert_eq!(v["report"]["stories"].as_array().unwrap().len(), 3);
    // Issue 17: the hand-off envelopes and the reactions.
    assert_eq!(v["schema_version"], 4);
    for key in ["axial", "shear", "reactions"] {
        assert!(!v["envelope"][key].as_array().unwrap().is_empty(), "{key}");
    }
    assert_eq!(v["report"]["supports"].as_array().unwrap().len(), 3);
    assert!(
        !v["report"]["service_reactions"]
            .as_array()
            .unwrap()
            .is_empty()
    );
    assert!(cases[0]["reactions"].is_array());
}

#[test]
fn check_hands_on_brace_forces_shears_and_reactions_in_every_format() {
    // The braced example: a pin-ended diagonal in bay 3 on each story.
    let model = "examples/depot-braced.toml";
    let text = ok(&["check", model]);
    for heading in [
        "Braces and beams",
        "Design shears",
        "Factored support reactions",
        "Unfactored reactions",
    ] {
        assert!(text.contains(heading), "text: {heading}");
    }
    assert!(
        text.contains(" D3.1 ") && text.contains("brace"),
        "the brace is listed"
    );
    let md = ok(&["check", model, "--format", "md"]);
    assert!(
        md.contains("axial forces, shears, reactions"),
        "the assumptions say where from"
    );
    assert!(md.contains("### Factored support reactions") && md.contains("| D3.1 |"));
    let detail = ok(&["check", model, "--detail"]);
    assert!(detail.contains("support reactions: design (second-order analysis)"));
}

#[test]
fn check_runs_with_every_second_order_method() {
    for method in ["direct", "aci-magnifier", "ec3-alpha-cr"] {
        let out = ok(&[
            "check",
            OFFICE,
            "--second-order",
            method,
            "--format",
            "json",
        ]);
        let v: serde_json::Value = serde_json::from_str(&out).expect("valid JSON");
        assert_eq!(v["report"]["method"], method);
        for c in v["report"]["cases"].as_array().unwrap() {
            assert!(
                c["direct"]["converged"].as_bool().unwrap(),
                "{method} {}",
                c["id"]
            );
            for s in c["stories"].as_array().unwrap() {
                // None on the second-order route (issue 16).
                if let Some(a) = s["sway_amplifier"].as_f64() {
                    assert!(a >= 1.0);
                }
            }
        }
    }
    // An unknown method is refused by the argument parser.
    let err = fails(&["check", OFFICE, "--second-order", "bogus"]);
    assert!(err.contains("--second-order"), "{err}");
}

#[test]
fn solve_every_example_case_with_a_residual_at_round_off() {
    // Issue #2 "done when": the equilibrium residual of every example is below 1e-9 of
    // the applied load.
    verify::source(
        "closed form: statics, applied loads + reactions = 0 (residual / applied load, issue #2 bound 1e-9)",
    );
    for path in examples() {
        let model = plumbline::input::load_model(&path).unwrap();
        let file = path.to_str().unwrap();
        for case in &model.load_cases {
            let out = ok(&["solve", file, "--case", &case.id, "--format", "json"]);
            let v: serde_json::Value = serde_json::from_str(&out).expect("valid JSON");
            let r = v["residual"]["relative"].as_f64().unwrap();
            let name = path.file_name().unwrap().to_string_lossy();
            verify::close(
                &format!("relative equilibrium residual, {name} case {}", case.id),
                "-",
                r,
                0.0,
                1e-9,
            );
            assert!(ok(&["solve", file, "--case", &case.id]).contains("licensed engineer"));
        }
    }
}

#[test]
fn cases_and_combos_run() {
    let out = ok(&["cases", OFFICE]);
    assert!(out.contains("2.3.1-4"), "{out}");
    let list = ok(&["combos"]);
    assert!(list.contains("asce7-16-strength"));
    let table = ok(&["combos", "asce7-16-strength"]);
    assert!(table.contains("ASCE/SEI 7-16"));
}

#[test]
fn an_unknown_table_fails_with_the_list_of_shipped_tables() {
    for args in [
        vec!["combos", "no-such-table"],
        vec!["cases", OFFICE, "--combos", "no-such-table"],
        vec!["check", OFFICE, "--combos", "no-such-table"],
    ] {
        let err = fails(&args);
        assert!(err.contains("no-such-table"), "{err}");
        assert!(err.contains("not a shipped combination table"), "{err}");
        assert!(
            err.contains("asce7-16-strength"),
            "names the shipped ones: {err}"
        );
    }
}

#[test]
fn an_unknown_load_case_names_the_ones_there_are() {
    let err = fails(&["solve", OFFICE, "--case", "XYZ"]);
    assert!(err.contains("XYZ") && err.contains("WL"), "{err}");
}

#[test]
fn malformed_models_fail_with_file_line_and_column() {
    // Rule 5 of the project: bad input never panics; the message names file, line and
    // column. Each variant edits one line of an example and expects that line number.
    let text =
        std::fs::read_to_string(Path::new(ROOT).join("examples/workshop-portal.toml")).unwrap();
    let line_of = |needle: &str| {
        text.lines()
            .position(|l| l.contains(needle))
            .unwrap_or_else(|| panic!("{needle} not in the example"))
            + 1
    };
    let dir = scratch("malformed");
    let variants: Vec<(&str, String, Option<usize>)> = vec![
        (
            "syntax",
            text.replacen("E = \"210 GPa\"", "E = \"210 GPa", 1),
            Some(line_of("E = \"210 GPa\"")),
        ),
        (
            "wrong-dimension",
            text.replacen("E = \"210 GPa\"", "E = \"210 kN*m\"", 1),
            Some(line_of("E = \"210 GPa\"")),
        ),
        (
            "unknown-node",
            text.replacen("j = \"C\"", "j = \"Z\"", 1),
            Some(line_of("j = \"C\"")),
        ),
        (
            "negative-inertia",
            text.replacen("I = \"18260 cm^4\"", "I = \"-18260 cm^4\"", 1),
            Some(line_of("I = \"18260 cm^4\"")),
        ),
        ("truncated", text[..text.len() / 2].to_string(), None),
        ("empty", String::new(), None),
        ("not-toml", "\u{0}\u{1}binary?".to_string(), None),
    ];
    for (name, body, line) in variants {
        let path = dir.join(format!("{name}.toml"));
        std::fs::write(&path, body).unwrap();
        let p = path.to_str().unwrap();
        for args in [vec!["check", p], vec!["solve", p, "--case", "G"]] {
            let err = fails(&args);
            assert!(err.contains(p), "{name}: the file is named: {err}");
            if let Some(line) = line {
                let located = format!("{p}:{line}:");
                assert!(
                    err.contains(&located),
                    "{name}: expected {located} in {err}"
                );
            }
        }
    }
    // A file that does not exist.
    let err = fails(&["check", "examples/no-such-model.toml"]);
    assert!(err.contains("no-such-model.toml"), "{err}");
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn output_file_is_written_whole_or_not_at_all() {
    let dir = scratch("output");
    let file = dir.join("report.txt");
    let f = file.to_str().unwrap();
    let partial = dir.join(".report.txt.partial");

    // Success: the file holds the report.
    ok(&["check", "examples/workshop-portal.toml", "--output", f]);
    let written = std::fs::read_to_string(&file).unwrap();
    assert!(written.contains("licensed engineer"));
    assert!(!partial.exists());

    // Failure of the command: an existing file is left as it was, nothing partial.
    std::fs::write(&file, "previous").unwrap();
    fails(&[
        "check",
        "examples/workshop-portal.toml",
        "--case",
        "nope",
        "--output",
        f,
    ]);
    assert_eq!(std::fs::read_to_string(&file).unwrap(), "previous");
    std::fs::remove_file(&file).unwrap();
    fails(&["check", "examples/no-such-model.toml", "--output", f]);
    fails(&["solve", OFFICE, "--case", "XYZ", "--output", f]);
    assert!(!file.exists(), "no file after a failed command");
    assert!(!partial.exists());

    // Failure to write: the target is a directory; no partial file is left beside it.
    let target = dir.join("taken");
    std::fs::create_dir(&target).unwrap();
    let err = fails(&[
        "check",
        "examples/workshop-portal.toml",
        "--output",
        target.to_str().unwrap(),
    ]);
    assert!(err.contains("could not write"), "{err}");
    assert!(!dir.join(".taken.partial").exists());
    let left: Vec<_> = std::fs::read_dir(&dir)
        .unwrap()
        .map(|e| e.unwrap().file_name())
        .collect();
    assert_eq!(left, [std::ffi::OsString::from("taken")]);
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn a_closed_pipe_does_not_panic() {
    // `plumbline check MODEL | head` closes the pipe before the report is printed; the
    // program should stop quietly (common practice for command-line tools, no source).
    let mut child = Command::new(BIN)
        .args(["check", "examples/workshop-portal.toml"])
        .current_dir(ROOT)
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    drop(child.stdout.take());
    let o = child.wait_with_output().unwrap();
    assert!(!stderr(&o).contains("panicked"), "{}", stderr(&o));
}

#[test]
fn new_writes_a_starter_model_that_checks() {
    let dir = scratch("new");
    for (units, bays, stories) in [("kN-m", "7.5,6", "4.5,3.6,3.6"), ("kip-ft", "30", "15")] {
        let file = dir.join(format!("{units}.toml"));
        let f = file.to_str().unwrap();
        let o = run(&[
            "new",
            f,
            "--bays",
            bays,
            "--stories",
            stories,
            "--units",
            units,
        ]);
        assert!(o.status.success(), "{}", stderr(&o));
        // The one-line note names the file written.
        assert!(stderr(&o).contains(&format!("wrote {f}")), "{}", stderr(&o));
        let text = std::fs::read_to_string(&file).unwrap();
        assert!(text.contains("licensed engineer") && text.contains("placeholder"));
        let model = plumbline::input::load_model(&file).unwrap();
        let n_bays = bays.split(',').count();
        let n_stories = stories.split(',').count();
        // Generated frame: (bays + 1) columns per story, one beam per bay and level.
        assert_eq!(
            model.members.len(),
            (n_bays + 1) * n_stories + n_bays * n_stories
        );
        let out = ok(&["check", f]);
        assert!(out.contains("Member envelope"), "{out}");
        // Never overwrites.
        let err = fails(&["new", f, "--bays", bays, "--stories", stories]);
        assert!(err.contains("exists"), "{err}");
    }
    let err = fails(&[
        "new",
        dir.join("bad.toml").to_str().unwrap(),
        "--bays",
        "6,-1",
        "--stories",
        "3",
    ]);
    assert!(err.contains("positive lengths"), "{err}");
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn completions_invalid_values_and_the_output_note() {
    let bash = ok(&["completions", "bash"]);
    assert!(bash.contains("plumbline") && bash.contains("--second-order"));
    // An invalid value lists the valid ones.
    let err = fails(&["check", OFFICE, "--second-order", "b1b2"]);
    for v in ["aisc-b1b2", "aci-magnifier", "ec3-alpha-cr", "direct"] {
        assert!(err.contains(v), "{err}");
    }
    let err = fails(&["check", OFFICE, "--format", "pdf"]);
    assert!(err.contains("table") && err.contains("md"), "{err}");
    let err = fails(&["check", OFFICE, "--case", "9.9"]);
    assert!(err.contains("2.3.1-1"), "the case ids are listed: {err}");

    // CSV: one file per table in the directory given with -o, each named on stderr.
    let dir = scratch("csv");
    let out = dir.join("tables");
    let o = run(&[
        "check",
        "examples/workshop-portal.toml",
        "--format",
        "csv",
        "-o",
        out.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    for name in [
        "assumptions.csv",
        "stories.csv",
        "members.csv",
        "columns.csv",
        "axial.csv",
        "shear.csv",
        "reactions.csv",
        "service-reactions.csv",
        "case-reactions.csv",
        "case-end-actions.csv",
    ] {
        assert!(out.join(name).exists(), "{name}");
        let text = std::fs::read_to_string(out.join(name)).unwrap();
        assert!(
            text.contains("licensed engineer"),
            "{name} carries the caution"
        );
        assert!(stderr(&o).contains(name), "{}", stderr(&o));
    }
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn report_writes_an_html_file_beside_the_model_or_where_asked() {
    let dir = scratch("report");
    let file = dir.join("office.html");
    let o = run(&["report", OFFICE, "-o", file.to_str().unwrap()]);
    assert!(o.status.success(), "{}", stderr(&o));
    assert!(stderr(&o).contains("office.html"));
    let html = std::fs::read_to_string(&file).unwrap();
    assert!(html.starts_with("<!DOCTYPE html>") && html.contains("licensed engineer"));
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn report_default_name_never_overwrites_the_model() {
    // Project requirement (issue 13 item 5, no external source): the input is never
    // modified. A model file that already ends in .html would be its own default report.
    let dir = scratch("report-default-name");
    let model = dir.join("frame.html");
    let text =
        std::fs::read_to_string(Path::new(ROOT).join("examples/workshop-portal.toml")).unwrap();
    std::fs::write(&model, &text).unwrap();
    let o = run(&["report", model.to_str().unwrap()]);
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(
        stderr(&o).contains("refusing to overwrite an input"),
        "{}",
        stderr(&o)
    );
    assert_eq!(std::fs::read_to_string(&model).unwrap(), text);
}

#[test]
fn a_mechanism_from_a_unit_slip_is_said_once_with_its_cause() {
    // Issue 20 item 5: I typed as bare m⁴ numbers under kN-m (section unit mm) makes every
    // member 10¹² too flexible in bending; the warnings name members and sections before
    // the error, the mechanism message says where the singular pivots sit, once.
    let err = fails(&["check", "tests/bad_inputs/units-inertia-m4-mechanism.toml"]);
    assert_eq!(err.matches("the frame is a mechanism").count(), 1, "{err}");
    assert!(
        err.contains("implausible properties (left, beam, right)"),
        "{err}"
    );
    let warning = err.find("warning:").expect("a warning");
    assert!(warning < err.find("mechanism").unwrap(), "{err}");
}

#[test]
fn text_rows_end_without_spaces_and_markdown_escapes_case_id_marks() {
    // Issue 20 item 8 (project requirements, no external source).
    for p in examples() {
        let text = ok(&["check", p.to_str().unwrap()]);
        assert!(!text.lines().any(|l| l.ends_with(' ')), "{}", p.display());
        let md = ok(&["check", p.to_str().unwrap(), "--format", "md"]);
        for l in md.lines().filter(|l| l.starts_with('|')) {
            let unescaped = l.replace("\\~", "");
            assert!(!unescaped.contains('~'), "{l}");
        }
    }
}

#[test]
fn solve_csv_writes_every_table_with_the_caution() {
    // Issue 20 item 8: like `check`, one CSV file per table, each closed by the caution.
    let dir = scratch("solve-csv");
    let run_out = run(&[
        "solve",
        OFFICE,
        "--case",
        "D",
        "--format",
        "csv",
        "-o",
        dir.to_str().unwrap(),
    ]);
    assert!(run_out.status.success(), "{}", stderr(&run_out));
    for name in ["displacements", "reactions", "end_actions", "span_moments"] {
        let text = std::fs::read_to_string(dir.join(format!("{name}.csv"))).unwrap();
        assert!(
            text.trim_end()
                .ends_with(&format!("# {}", plumbline::CAUTION)),
            "{name}"
        );
    }
}
