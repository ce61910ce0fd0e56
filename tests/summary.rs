//! The one-page summary of `check` and its files: envelope values against a hand
//! calculation, JSON round trip, CSV parsing, and the sway/no-sway flag.
//!
//! Results assist a licensed engineer; local codes and the adopted edition of each
//! standard govern.

use std::path::{Path, PathBuf};

mod common;

use common::verify;

use plumbline::app::{CheckArgs, emit_check, render_check, run_check};
use plumbline::envelope::{Location, MemberEnvelope};
use plumbline::report::CheckFormat;
use plumbline::report::summary::CheckDoc;

/// A two-combination test table (not a standard: the factors only make the hand
/// calculation below distinct per case).
const TABLE: &str = r#"
title = "Two-combination test table"
standard = "test only"
edition = "none"
source = "written for this test"
clauses = ["T-1", "T-2"]
basis = "strength"
caution = "Test only: verify against the edition adopted where the building stands."

[actions]
D = { category = "dead", description = "dead load" }
W = { category = "wind", description = "wind load" }

[[combination]]
id = "T-1"
tag = "verify"
terms = [{ D = 1.4 }]

[[combination]]
id = "T-2"
tag = "verify"
terms = [{ D = 1.2 }, { W = 1.6, principal = true }]
"#;

/// A cantilever column (fixed base N0, top N1 at h = 4 m) carrying a beam hinged at the
/// column top and resting on a roller at N2 (L = 6 m): the beam is simply supported and
/// the column alone resists the lateral load. D: w = 10 kN/m on the beam; W: H = 5 kN at
/// the column top, to the right.
const MODEL: &str = r#"
title = "Hand-check frame: propped beam on a cantilever column"
units = "kN-m"

[[material]]
id = "steel"
E = "200 GPa"

[[section]]
id = "col"
A = "10000 mm^2"
I = "1e8 mm^4"
role = "column"

[[section]]
id = "beam"
A = "10000 mm^2"
I = "2e8 mm^4"
role = "beam"

[[node]]
id = "N0"
x = 0
y = 0

[[node]]
id = "N1"
x = 0
y = 4

[[node]]
id = "N2"
x = 6
y = 4

[[member]]
id = "col"
i = "N0"
j = "N1"
section = "col"
material = "steel"

[[member]]
id = "beam"
i = "N1"
j = "N2"
section = "beam"
material = "steel"
hinge = "i"

[[support]]
node = "N0"
type = "fixed"

[[support]]
node = "N2"
type = "roller-x"

[[case]]
id = "D"
description = "beam load"
category = "dead"

[[case.member_load]]
members = "beam"
kind = "uniform"
direction = "down"
w = 10

[[case]]
id = "W"
description = "lateral load at the column top"
category = "wind"

[[case.node_load]]
nodes = "N1"
fx = 5

[combinations]
table = "table.toml"

[analysis]
method = "ec3-alpha-cr"
stiffness = "gross"
notional = "none"
"#;

/// The model and table written to a scratch directory; returns the model path.
fn write_model(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("plumbline-summary-{name}-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    std::fs::write(dir.join("table.toml"), TABLE).unwrap();
    let path = dir.join("hand.toml");
    std::fs::write(&path, MODEL).unwrap();
    path
}

fn member<'a>(members: &'a [MemberEnvelope], id: &str) -> &'a MemberEnvelope {
    members.iter().find(|m| m.member == id).unwrap()
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-6 * b.abs().max(1.0)
}

#[test]
fn summary_of_a_two_case_model_equals_the_hand_maxima() {
    verify::source(
        "closed form: statics of a determinate frame, hand calculation (w = 10 kN/m, L = 6 m, \
         h = 4 m, H = 5 kN); EN 1993-1-1:2005 §5.2.1(3), α_cr ≥ 10",
    );
    let path = write_model("hand");
    let run = run_check(&path, &CheckArgs::default(), &mut |_, _| {}).unwrap();
    let env = &run.envelope;
    assert_eq!(env.cases, ["T-1", "T-2"]);
    assert!(env.unstable.is_empty());

    // Hand calculation (closed form, statics of a determinate frame; w = 10 kN/m,
    // L = 6 m, h = 4 m, H = 5 kN):
    // * The beam is simply supported (hinge at N1, roller at N2): M_max = wL²/8 at
    //   x = L/2 = 45 kN·m per unit factor. T-1: 1.4 × 45 = 63 kN·m; T-2: 1.2 × 45 = 54.
    //   Largest positive span moment: 63 kN·m at x = 3 m, case T-1; end shear
    //   1.4 × wL/2 = 42 kN; no negative moment anywhere in the beam.
    // * The column gets the beam reaction wL/2 = 30 kN as axial load and no moment from
    //   the hinged beam; all lateral load goes to it (the roller takes no horizontal
    //   force). Base moment H·h = 20 kN·m per unit factor, windward (−X, local +y) face
    //   in tension, so negative: T-2 gives −1.6 × 20 = −32 kN·m, with N = −1.2 × 30 =
    //   −36 kN and V = 1.6 × 5 = 8 kN. The top moment is zero.
    // * Largest column compression: T-1, 1.4 × 30 = 42 kN.
    // * EN 1993-1-1 §5.2.1(3): α_cr = (H/V)(h/δ) ≥ 10 in both cases (δ = 1.6H·h³/3EI
    //   = 8.533 mm under T-2: α_cr = (8/36)(4000/8.533) = 104), so no amplification: the
    //   design moments equal the first-order ones.
    let beam = member(&env.members, "beam");
    let span = &beam.sections[1];
    assert_eq!(span.location, Location::Span);
    let p = span.positive.as_ref().expect("sagging beam moment");
    verify::close(
        "beam span moment, T-1: 1.4·wL²/8",
        "N·m",
        p.moment,
        63e3,
        1e-6,
    );
    verify::close("position of the span moment, L/2", "m", p.x, 3.0, 1e-6);
    verify::same(
        "case of the beam's span moment (1.4 > 1.2)",
        "T-1",
        p.case.as_str(),
    );
    assert_eq!(p.expression, "1.4D");
    verify::close("beam end shear, T-1: 1.4·wL/2", "N", p.shear, 42e3, 1e-6);
    verify::same(
        "part governing the beam (its own load)",
        "no-sway",
        p.governs.as_str(),
    );
    for s in &beam.sections {
        verify::same(
            &format!(
                "beam, {:?}: a hogging moment (simply supported)",
                s.location
            ),
            false,
            s.negative.is_some(),
        );
    }

    let col = member(&env.members, "col");
    let base = &col.sections[0];
    assert_eq!(base.location, Location::EndI);
    let n = base.negative.as_ref().expect("base moment");
    verify::close(
        "column base moment, T-2: −1.6·H·h",
        "N·m",
        n.moment,
        -32e3,
        1e-6,
    );
    verify::same(
        "case of the column's base moment (1.6·H)",
        "T-2",
        n.case.as_str(),
    );
    verify::close(
        "column axial force, T-2: −1.2·wL/2",
        "N",
        n.axial,
        -36e3,
        1e-6,
    );
    verify::close("column Pr, T-2", "N", n.p_r, 36e3, 1e-6);
    verify::close("column base shear, T-2: 1.6·H", "N", n.shear, 8e3, 1e-6);
    verify::same(
        "column base: a positive moment",
        false,
        base.positive.is_some(),
    );
    verify::same(
        "column top: a moment (the beam is hinged)",
        false,
        col.sections[2].positive.is_some() || col.sections[2].negative.is_some(),
    );
    let c = col.compression.as_ref().expect("column compression");
    verify::close(
        "largest column compression, T-1: 1.4·wL/2",
        "N",
        c.p_r,
        42e3,
        1e-6,
    );
    verify::same(
        "case of the largest column compression",
        "T-1",
        c.case.as_str(),
    );
    verify::same("column tension", false, col.tension.is_some());

    // Story drift under T-2: δ/h = 8.533 mm / 4 m = 1/469 (closed form, cantilever
    // δ = P·h³/(3EI) with P = 8 kN, EI = 200e9 × 1e-4 = 2e7 N·m²).
    let story = &env.stories[0];
    let drift = story.drift_ratio.as_ref().unwrap();
    verify::close(
        "story drift ratio δ/h, T-2: P·h³/(3EI)/h",
        "-",
        drift.value,
        8e3 * 64.0 / (3.0 * 2e7) / 4.0,
        1e-6,
    );
    verify::same(
        "case of the largest drift (the only lateral case)",
        "T-2",
        drift.case.as_str(),
    );
    // Both cases govern something.
    assert!(env.never_govern.is_empty(), "{:?}", env.never_govern);

    let text = render_check(&run, CheckFormat::Table, false).joined();
    assert!(
        text.contains("Cases included: all 2 factored cases"),
        "{text}"
    );
    assert!(text.contains("63.0") && text.contains("-32.0"), "{text}");
    assert!(text.contains("licensed engineer"));
}

#[test]
fn sway_governs_the_column_and_no_sway_the_beam() {
    // In the hand-check frame the beam's moment comes from its own load, held or not
    // (no-sway part), and the column's from the lateral load, which the held frame
    // takes in the hold (sway part): see the hand calculation above.
    verify::source("closed form: statics of the determinate hand-check frame");
    let path = write_model("flag");
    let run = run_check(&path, &CheckArgs::default(), &mut |_, _| {}).unwrap();
    let col = member(&run.envelope.members, "col")
        .governing
        .clone()
        .unwrap();
    verify::same(
        "part governing the column (the lateral load)",
        "sway",
        col.governs.as_str(),
    );
    verify::same("column's governing section", Location::EndI, col.location);
    let beam = member(&run.envelope.members, "beam")
        .governing
        .clone()
        .unwrap();
    verify::same(
        "part governing the beam (its own load)",
        "no-sway",
        beam.governs.as_str(),
    );
    verify::same("beam's governing section", Location::Span, beam.location);
    // The flags reach every format.
    let json = render_check(&run, CheckFormat::Json, false).joined();
    let doc: CheckDoc = serde_json::from_str(&json).unwrap();
    let g: Vec<(&str, &str)> = doc
        .governing
        .iter()
        .map(|g| (g.member.as_str(), g.governs.as_str()))
        .collect();
    assert_eq!(g, [("col", "sway"), ("beam", "no-sway")]);
}

#[test]
fn json_round_trips_through_serde() {
    let path = write_model("json");
    for args in [
        CheckArgs::default(),
        CheckArgs {
            case: Some("T-2".into()),
            ..Default::default()
        },
    ] {
        let run = run_check(&path, &args, &mut |_, _| {}).unwrap();
        let json = render_check(&run, CheckFormat::Json, false).joined();
        let value: serde_json::Value = serde_json::from_str(&json).unwrap();
        let doc: CheckDoc = serde_json::from_str(&json).unwrap();
        assert_eq!(serde_json::to_value(&doc).unwrap(), value);
        assert_eq!(
            doc.schema_version,
            plumbline::report::summary::SCHEMA_VERSION
        );
        assert!(doc.caution.contains("licensed engineer"));
        assert_eq!(doc.selection.filter, args.case);
        assert_eq!(doc.model_sha256.len(), 64);
    }
}

/// Issue 21: the JSON document and the CSV files streamed to their files hold exactly what
/// the in-memory rendering holds (same values, keys and text), and the report section is
/// the check report itself.
/// A value serialized to text and parsed back.
fn parsed<T: serde::Serialize>(v: &T) -> serde_json::Value {
    serde_json::from_str(&serde_json::to_string(v).unwrap()).unwrap()
}

#[test]
fn streamed_files_equal_the_rendered_text() {
    let path = write_model("stream");
    let dir = path.with_extension("out");
    for approximate in [false, true] {
        let args = CheckArgs {
            approximate,
            ..Default::default()
        };
        let run = run_check(&path, &args, &mut |_, _| {}).unwrap();
        let file = dir.join("check.json");
        std::fs::create_dir_all(&dir).unwrap();
        let written = emit_check(&run, CheckFormat::Json, false, Some(&file)).unwrap();
        assert_eq!(written, std::slice::from_ref(&file));
        let streamed = std::fs::read_to_string(&file).unwrap();
        assert_eq!(
            streamed,
            render_check(&run, CheckFormat::Json, false).joined()
        );
        // Both sides parsed by the same parser (serde_json's default float parsing may
        // differ from `to_value` in the last bit).
        let value: serde_json::Value = serde_json::from_str(&streamed).unwrap();
        assert_eq!(value["report"], parsed(&run.report));
        assert_eq!(value["envelope"], parsed(&run.envelope));
        assert_eq!(value.get("approximate").is_some(), approximate);
        let csv_dir = dir.join("csv");
        let written = emit_check(&run, CheckFormat::Csv, false, Some(&csv_dir)).unwrap();
        let rendered = render_check(&run, CheckFormat::Csv, false);
        assert_eq!(written.len(), rendered.files.len());
        for (name, text) in &rendered.files {
            assert_eq!(&std::fs::read_to_string(csv_dir.join(name)).unwrap(), text);
        }
    }
    std::fs::remove_dir_all(&dir).unwrap();
}

#[test]
fn csv_files_parse_with_the_csv_crate() {
    let path = write_model("csv");
    let run = run_check(&path, &CheckArgs::default(), &mut |_, _| {}).unwrap();
    let files = render_check(&run, CheckFormat::Csv, false).files;
    let names: Vec<&str> = files.iter().map(|(n, _)| n.as_str()).collect();
    for want in [
        "assumptions.csv",
        "stories.csv",
        "members.csv",
        "columns.csv",
    ] {
        assert!(names.contains(&want), "{names:?}");
    }
    for (name, text) in &files {
        assert!(text.contains("licensed engineer"), "{name}: caution");
        let mut r = csv::ReaderBuilder::new()
            .comment(Some(b'#'))
            .from_reader(text.as_bytes());
        let width = r.headers().unwrap().len();
        let rows: Vec<csv::StringRecord> = r.records().map(|x| x.unwrap()).collect();
        assert!(!rows.is_empty(), "{name}");
        assert!(rows.iter().all(|x| x.len() == width), "{name}");
    }
    // The tidy member envelope: one row per member, section and sign; the beam's sagging
    // moment is 63 kN·m (hand calculation in the first test).
    let members = &files.iter().find(|(n, _)| n == "members.csv").unwrap().1;
    let mut r = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(members.as_bytes());
    let h = r.headers().unwrap().clone();
    let col = |name: &str| h.iter().position(|x| x.starts_with(name)).unwrap();
    let rows: Vec<csv::StringRecord> = r.records().map(|x| x.unwrap()).collect();
    assert_eq!(rows.len(), 2, "beam span + and column base −");
    let beam = rows.iter().find(|x| &x[col("member")] == "beam").unwrap();
    assert_eq!(&beam[col("at")], "span");
    assert_eq!(&beam[col("sign")], "positive");
    let m: f64 = beam[col("M design")].parse().unwrap();
    assert!(close(m, 63.0), "{m}");
}

#[test]
fn headings_say_which_cases_were_included() {
    let path = write_model("filter");
    let args = CheckArgs {
        case: Some("T-2".into()),
        ..Default::default()
    };
    let run = run_check(&path, &args, &mut |_, _| {}).unwrap();
    let text = render_check(&run, CheckFormat::Table, true).joined();
    assert!(
        text.contains("Cases included: 1 of 2 factored cases (ids starting with \"T-2\")"),
        "{text}"
    );
    // --case implies the per-case detail.
    assert!(text.contains("Case T-2:"), "{text}");
    let csv = render_check(&run, CheckFormat::Csv, false).files;
    let assumptions = &csv.iter().find(|(n, _)| n == "assumptions.csv").unwrap().1;
    assert!(
        assumptions.contains("1 of 2 factored cases"),
        "{assumptions}"
    );
    let md = render_check(&run, CheckFormat::Md, false).joined();
    assert!(md.contains("1 of 2 factored cases") && md.contains("licensed engineer"));
    let _ = std::fs::remove_dir_all(Path::new(&path).parent().unwrap());
}
