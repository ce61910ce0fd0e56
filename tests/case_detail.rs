//! Issue 21 goal 3 (memory linear in the storeys): a run that prints only the one-page
//! summary folds each case's member results into the envelope as the case is checked and
//! then drops them (`app::run_check_keeping(.., false)`). Its envelope and its summary
//! must be exactly those of a run that keeps every case's results, and of the envelope
//! formed afterwards from the whole report (`envelope::envelope`). No engineering figure
//! is new here: the check is that two bookkeepings of the same figures agree, bit for bit.
//! Source: closed form (an identity: the same figures enveloped two ways are equal); no
//! external value is compared, so nothing here enters the verification record.

mod common;

use common::examples;

use std::path::Path;

use plumbline::app::{CheckArgs, render_check, run_check, run_check_keeping};
use plumbline::model::SecondOrderMethod;
use plumbline::report::CheckFormat;

const METHODS: [Option<SecondOrderMethod>; 5] = [
    None,
    Some(SecondOrderMethod::AiscB1B2),
    Some(SecondOrderMethod::AciMagnifier),
    Some(SecondOrderMethod::Ec3AlphaCr),
    Some(SecondOrderMethod::Direct),
];

/// Every example under its own method and every other: the summary-only run has the
/// envelope and the text and Markdown summaries of the full run, and the full run's
/// envelope is the one formed from its whole report afterwards.
#[test]
fn summary_only_run_gives_the_envelope_and_summary_of_the_full_run() {
    for path in examples() {
        for method in METHODS {
            let args = CheckArgs {
                method,
                ..Default::default()
            };
            let name = format!("{} {method:?}", path.display());
            let full = run_check(&path, &args, &mut |_, _| {}).unwrap();
            let lean = run_check_keeping(&path, &args, &mut |_, _| {}, false).unwrap();
            assert!(full.case_detail && !lean.case_detail);
            assert_eq!(
                full.envelope,
                plumbline::envelope::envelope(&full.report),
                "{name}: folded against formed afterwards"
            );
            assert_eq!(lean.envelope, full.envelope, "{name}: envelope");
            for format in [CheckFormat::Table, CheckFormat::Md] {
                assert_eq!(
                    render_check(&lean, format, false).joined(),
                    render_check(&full, format, false).joined(),
                    "{name}: {format} summary"
                );
            }
            // What the summary-only run drops, and only that.
            assert_eq!(lean.report.cases.len(), full.report.cases.len());
            for (l, f) in lean.report.cases.iter().zip(&full.report.cases) {
                assert!(l.members.is_empty() && l.buckled_shape.is_none());
                let mut f = f.clone();
                f.drop_member_detail();
                assert_eq!(l, &f, "{name}: case {}", l.id);
            }
        }
    }
}

/// `--case PREFIX` keeps some cases (a prefix may name a notional variant): the envelope
/// is over those alone, whichever way it is formed.
#[test]
fn a_case_prefix_envelopes_only_the_cases_it_keeps() {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/office-3story.toml");
    let all = run_check(&path, &CheckArgs::default(), &mut |_, _| {}).unwrap();
    let first = &all.report.cases[0].id;
    // The prefix of the first case's id up to its first '/', or the whole id.
    let prefix = first.split('/').next().unwrap().to_string();
    let args = CheckArgs {
        case: Some(prefix.clone()),
        ..Default::default()
    };
    let full = run_check(&path, &args, &mut |_, _| {}).unwrap();
    let lean = run_check_keeping(&path, &args, &mut |_, _| {}, false).unwrap();
    assert!(full.report.cases.iter().all(|c| c.id.starts_with(&prefix)));
    assert!(full.report.cases.len() < all.report.cases.len());
    assert_eq!(full.envelope.cases.len(), full.report.cases.len());
    assert_eq!(full.envelope, plumbline::envelope::envelope(&full.report));
    assert_eq!(lean.envelope, full.envelope);
}

/// `--lean` (issue 21 goal 2, a leaner JSON): the JSON document of a lean run is the full
/// run's with each case's `members` emptied, its `buckled_shape` null and `case_detail`
/// false, and nothing else changed; the lean CSV files are the full run's but the two
/// tables of member rows by case. Every example under its own method.
#[test]
fn lean_json_and_csv_are_the_full_ones_less_the_member_rows_by_case() {
    use plumbline::app::run_check_for;
    for path in examples() {
        let name = path.display().to_string();
        let run = |format: CheckFormat, lean: bool| {
            let args = CheckArgs {
                format,
                lean,
                ..Default::default()
            };
            let run = run_check_for(&path, &args, &mut |_, _| {}).unwrap();
            assert_eq!(run.case_detail, !lean, "{name}");
            render_check(&run, format, false)
        };
        let full: serde_json::Value =
            serde_json::from_str(&run(CheckFormat::Json, false).joined()).unwrap();
        let lean: serde_json::Value =
            serde_json::from_str(&run(CheckFormat::Json, true).joined()).unwrap();
        assert_eq!(full["case_detail"], true, "{name}");
        let mut expected = full.clone();
        expected["case_detail"] = false.into();
        for case in expected["report"]["cases"].as_array_mut().unwrap() {
            case["members"] = serde_json::json!([]);
            case["buckled_shape"] = serde_json::Value::Null;
        }
        assert_eq!(lean, expected, "{name}: lean JSON");
        let files = |lean: bool| -> Vec<(String, String)> { run(CheckFormat::Csv, lean).files };
        let expected: Vec<(String, String)> = files(false)
            .into_iter()
            .filter(|(n, _)| n != "case-members.csv" && n != "case-end-actions.csv")
            .collect();
        assert_eq!(files(true), expected, "{name}: lean CSV");
    }
    // With the per-case detail asked for, a lean run is refused.
    let path = &examples()[0];
    let args = CheckArgs {
        lean: true,
        detail: true,
        ..Default::default()
    };
    let err = run_check_for(path, &args, &mut |_, _| {})
        .err()
        .expect("refused");
    assert!(err.to_string().contains("--lean"), "{err}");
}
