//! Assembles `docs/verification.md` (issue 22) from the records the other test binaries
//! leave through `common::verify` during `cargo test`.
//!
//! With `PLUMBLINE_WRITE_VERIFICATION=1` it writes `docs/verification.md`; without it, it
//! renders the record into the target folder only, so a partial run (`cargo test --test
//! X`) never touches the committed document. `.ci/run` clears the records, runs the whole
//! suite, then runs this target with the variable set and fails when the committed file
//! differs. The document is sorted by id and carries no time or machine detail, so the
//! same suite gives the same file.

mod common;

use common::verify::{record_dir, scaled_difference};
use serde_json::Value;
use std::collections::BTreeMap;
use std::fmt::Write as _;

/// Formats a value with five significant digits, fixed-point in a readable range and
/// scientific outside it; exact zero is `0`.
fn number(x: f64) -> String {
    if x == 0.0 {
        return "0".into();
    }
    let magnitude = x.abs().log10().floor() as i32;
    if (-3..6).contains(&magnitude) {
        format!("{:.*}", (4 - magnitude).max(0) as usize, x)
    } else {
        format!("{x:.4e}")
    }
}

/// Formats a relative difference: below 10⁻⁹ (or below the tolerance, when that is
/// smaller) it is round-off and printed as a bound, so the last bits of a floating-point
/// sum never change the document.
fn difference(d: f64, tol: f64) -> String {
    let floor = tol.min(1e-9);
    if d == 0.0 {
        "0".into()
    } else if d < floor {
        format!("< {floor:.0e}")
    } else {
        format!("{d:.1e}")
    }
}

/// Formats the worst figure of a property: round-off (below 10⁻⁶) as the power of ten
/// that bounds it, so the document does not change with the last bits of a sum; larger
/// figures with five significant digits.
fn worst(x: f64) -> String {
    if x == 0.0 {
        "0".into()
    } else if x > 0.0 && x < 1e-6 {
        format!("≤ 1e{}", x.log10().ceil() as i32)
    } else {
        number(x)
    }
}

/// Formats a computed value: round-off about an expected zero (its difference below the
/// round-off floor of [`difference`]) reads `≈ 0`, so that the last bits of a sum never
/// change the document; anything else as [`number`].
fn computed(c: f64, expected: f64, scaled: f64, tol: f64) -> String {
    if expected == 0.0 && c != 0.0 && scaled < tol.min(1e-9) {
        "≈ 0".into()
    } else {
        number(c)
    }
}

/// Formats a tolerance; zero reads `exact`.
fn tolerance(t: f64) -> String {
    if t == 0.0 {
        "exact".into()
    } else {
        format!("{t:.0e}")
    }
}

/// Escapes the characters that would break a Markdown table cell.
fn cell(s: &str) -> String {
    s.replace('|', "\\|").replace('\n', " ")
}

/// Reads every record of the folder, keyed (and so sorted) by id.
fn read_records() -> BTreeMap<String, Value> {
    let mut records = BTreeMap::new();
    let Ok(entries) = std::fs::read_dir(record_dir()) else {
        return records;
    };
    for entry in entries.flatten() {
        let path = entry.path();
        if path.extension().and_then(|e| e.to_str()) != Some("json") {
            continue;
        }
        let text = std::fs::read_to_string(&path).expect("read record");
        let value: Value = serde_json::from_str(&text).expect("record is JSON");
        let id = value["id"].as_str().expect("record id").to_string();
        records.insert(id, value);
    }
    records
}

/// Splits an id `file/test/rest` into the test file, the test and the rest.
fn parts(id: &str) -> (&str, &str, &str) {
    let mut it = id.splitn(3, '/');
    let file = it.next().unwrap_or_default();
    let test = it.next().unwrap_or_default();
    (file, test, it.next().unwrap_or_default())
}

/// One row of a check: quantity (with its unit), expected, computed, difference, tolerance.
fn check_row(v: &Value) -> [String; 5] {
    let s = |k: &str| v[k].as_str().unwrap_or_default().to_string();
    let f = |k: &str| v[k].as_f64().unwrap_or(f64::NAN);
    let unit = s("unit");
    let quantity = match unit.as_str() {
        "" | "-" | "factors" => s("quantity"),
        _ => format!("{} [{unit}]", s("quantity")),
    };
    if v.get("lower").is_some() {
        return bound_row(v, quantity);
    }
    let (expected, computed, diff) = if v.get("expected_text").is_some() {
        // Text values (factors): the test's own largest difference.
        (
            s("expected_text"),
            s("computed_text"),
            difference(f("difference"), f("tolerance")),
        )
    } else {
        let (e, c, scale) = (f("expected"), f("computed"), f("scale"));
        // A difference measured against the problem's scale rather than the expected value
        // is marked with the scale.
        let against = if scale == e.abs() {
            String::new()
        } else {
            format!(" (of {})", number(scale))
        };
        let scaled = scaled_difference(e, c, scale);
        (
            number(e),
            computed(c, e, scaled, f("tolerance")),
            difference(scaled, f("tolerance")) + &against,
        )
    };
    [
        quantity,
        expected,
        computed,
        diff,
        tolerance(f("tolerance")),
    ]
}

/// Formats one side of a bound: `0`, or the signed value with one digit.
fn side(x: f64) -> String {
    if x == 0.0 {
        "0".into()
    } else {
        format!("{x:+.0e}")
    }
}

/// One row of a bound (`verify::between`): the reference, the computed value, the signed
/// difference over the reference's size (absolute when the reference is zero) and the
/// permitted range of that difference.
fn bound_row(v: &Value, quantity: String) -> [String; 5] {
    let f = |k: &str| v[k].as_f64();
    let (e, c) = (
        f("expected").unwrap_or(f64::NAN),
        f("computed").unwrap_or(f64::NAN),
    );
    let s = if e == 0.0 { 1.0 } else { e.abs() };
    let d = (c - e) / s;
    let diff = if d != 0.0 && d.abs() < 1e-9 {
        "< 1e-9".to_string()
    } else if d == 0.0 {
        "0".to_string()
    } else {
        format!("{d:+.1e}")
    };
    let range = match (f("lower"), f("upper")) {
        (Some(l), Some(u)) => format!("{} … {}", side(l), side(u)),
        (Some(l), None) => format!("≥ {}", side(l)),
        (None, Some(u)) => format!("≤ {}", side(u)),
        (None, None) => "any".to_string(),
    };
    [
        quantity,
        number(e),
        computed(c, e, d.abs(), 1e-9),
        diff,
        range,
    ]
}

/// Renders the whole document.
fn render(records: &BTreeMap<String, Value>) -> String {
    let text = |v: &Value, k: &str| v[k].as_str().unwrap_or_default().to_string();
    let checks: Vec<&Value> = records.values().filter(|v| v["kind"] == "check").collect();
    let properties: Vec<&Value> = records
        .values()
        .filter(|v| v["kind"] == "property")
        .collect();
    // file → test → checks, all sorted by id.
    let mut files: BTreeMap<&str, BTreeMap<&str, Vec<&Value>>> = BTreeMap::new();
    for v in &checks {
        let (file, test, _) = parts(v["id"].as_str().unwrap_or_default());
        files
            .entry(file)
            .or_default()
            .entry(test)
            .or_default()
            .push(v);
    }
    let mut out = String::new();
    let _ = writeln!(out, "# Verification record\n");
    let _ = writeln!(
        out,
        "Generated by `tests/verification_record.rs` from the test suite itself: every row is an \
         assertion that ran in `cargo test` and passed. Do not edit by hand; `.ci/run` \
         regenerates it and fails when this file is stale (see \
         [DEVELOPERS.md](../DEVELOPERS.md#the-verification-record)). To regenerate it by \
         hand: `rm -rf target/tmp/verification && cargo test --release`, then \
         `PLUMBLINE_WRITE_VERIFICATION=1 cargo test --release --test verification_record` \
         (with `CARGO_TARGET_DIR` set, clear its `tmp/verification` instead).\n"
    );
    let _ = writeln!(
        out,
        "These results assist a licensed engineer; local codes and the adopted edition of each \
         standard govern.\n"
    );
    let _ = writeln!(
        out,
        "{} external checks in {} test files; {} properties over seeded random frames.\n",
        checks.len(),
        files.len(),
        properties.len()
    );
    let _ = writeln!(
        out,
        "Relative difference is |computed − expected| / |expected|, or, where the row names a \
         scale (\"of …\"), divided by that scale: the size of the quantity in the problem (wL \
         for an end force, for instance), for quantities that may be zero. A check passes when \
         it is at most the tolerance. Combination factors are compared factor by factor; their \
         difference is the largest over the case's factors. Sources carry the reference notes' \
         tags: [C] confirmed from the cited source, [M] or `from memory` recalled, [X] \
         computed from the cited formula; `common practice, no source` marks a rule of thumb. \
         Values are in SI units (N, m, Pa) unless the quantity names others. A bound (a \
         safe-side estimate, a code limit) shows the signed difference (computed − \
         reference) / |reference| (absolute when the reference is zero) and its permitted \
         range, `≥ 0` for \"at least the reference\". Counts, verdicts and names are \
         compared exactly. A computed value that is round-off about an expected zero (below \
         10⁻⁹ of its scale, or of the tolerance when that is smaller) reads ≈ 0.\n"
    );
    let _ = writeln!(out, "| Test file | Tests or groups | Checks |");
    let _ = writeln!(out, "|---|---:|---:|");
    for (file, tests) in &files {
        let n: usize = tests.values().map(Vec::len).sum();
        let _ = writeln!(out, "| `tests/{file}.rs` | {} | {n} |", tests.len());
    }
    let _ = writeln!(out, "\n## External checks\n");
    for (file, tests) in &files {
        let _ = writeln!(out, "### `tests/{file}.rs`\n");
        for (test, rows) in tests {
            let _ = writeln!(out, "#### `{test}`\n");
            let mut sources: Vec<String> = rows.iter().map(|v| text(v, "source")).collect();
            sources.dedup();
            let one_source = sources.len() == 1;
            if one_source {
                let _ = writeln!(out, "Source: {}\n", sources[0]);
                let _ = writeln!(
                    out,
                    "| Quantity | Expected | Computed | Rel. difference | Tolerance |"
                );
                let _ = writeln!(out, "|---|---:|---:|---:|---:|");
            } else {
                let _ = writeln!(
                    out,
                    "| Quantity | Source | Expected | Computed | Rel. difference | Tolerance |"
                );
                let _ = writeln!(out, "|---|---|---:|---:|---:|---:|");
            }
            for v in rows {
                let [q, e, c, d, t] = check_row(v);
                let source = if one_source {
                    String::new()
                } else {
                    format!(" {} |", cell(&text(v, "source")))
                };
                let _ = writeln!(
                    out,
                    "| {} |{source} {} | {} | {d} | {t} |",
                    cell(&q),
                    cell(&e),
                    cell(&c)
                );
            }
            let _ = writeln!(out);
        }
    }
    let _ = writeln!(out, "## Properties over seeded random frames\n");
    let _ = writeln!(
        out,
        "Frames from `tests/common/random_frame.rs` (irregular bays and stories, releases, \
         fixed, pinned and spring bases, braces, leaning columns, ordinary, tiny, zero and \
         mixed-sign lateral loads) unless the property names another generator. The worst \
         figure is the one seen over all frames of the \
         run; the test holds it to the limit.\n"
    );
    let _ = writeln!(
        out,
        "| Property | Asserts | Frames | Figure | Worst seen | Limit |"
    );
    let _ = writeln!(out, "|---|---|---:|---|---:|---|");
    for v in &properties {
        let _ = writeln!(
            out,
            "| `{}` | {} | {} | {} | {} | {} |",
            text(v, "id"),
            cell(&text(v, "asserts")),
            v["frames"].as_u64().unwrap_or(0),
            cell(&text(v, "figure")),
            worst(v["worst"].as_f64().unwrap_or(f64::NAN)),
            cell(&text(v, "limit")),
        );
    }
    out
}

#[test]
fn verification_record() {
    let records = read_records();
    let text = render(&records);
    let preview = record_dir().join("verification.md");
    std::fs::write(&preview, &text).ok();
    if std::env::var_os("PLUMBLINE_WRITE_VERIFICATION").is_some() {
        assert!(
            !records.is_empty(),
            "no records in {}: run the whole `cargo test` first",
            record_dir().display()
        );
        let doc = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("docs/verification.md");
        std::fs::write(&doc, text).expect("write docs/verification.md");
    }
}

#[test]
fn numbers_are_formatted_stably() {
    assert_eq!(number(268.9), "268.90");
    assert_eq!(number(0.225), "0.22500");
    assert_eq!(number(1.5e-7), "1.5000e-7");
    assert_eq!(number(0.0), "0");
    assert_eq!(difference(3e-12, 1e-2), "< 1e-9");
    assert_eq!(difference(3e-12, 1e-10), "< 1e-10");
    assert_eq!(difference(0.0123, 1e-1), "1.2e-2");
    assert_eq!(difference(0.0, 0.0), "0");
    assert_eq!(tolerance(0.0), "exact");
    assert_eq!(tolerance(1e-3), "1e-3");
    assert_eq!(worst(3.2e-13), "≤ 1e-12");
    assert_eq!(worst(0.25), "0.25000");
    assert_eq!(computed(-1.6653e-12, 0.0, 5.6e-17, 1e-10), "≈ 0");
    assert_eq!(computed(-0.0066666, 0.0, 1.9e-6, 1e-5), "-0.0066666");
    assert_eq!(computed(1e-12, 0.0, 1e-12, 0.0), "1.0000e-12");
    assert_eq!(computed(3.0, 3.0, 0.0, 1e-9), "3.0000");
    let bound = |e: f64, c: f64, l: Value, u: Value| {
        let v = serde_json::json!({"expected": e, "computed": c, "lower": l, "upper": u});
        bound_row(&v, "q".into())
    };
    assert_eq!(
        bound(10.0, 187.0, 0.0.into(), Value::Null),
        ["q", "10.000", "187.00", "+1.8e1", "≥ 0"].map(String::from)
    );
    assert_eq!(
        bound(2.0, 1.999, (-5e-3).into(), 1e-3.into())[3..],
        ["-5.0e-4", "-5e-3 … +1e-3"].map(String::from)
    );
    assert_eq!(
        bound(0.0, 2e-4, Value::Null, 1e-3.into())[3..],
        ["+2.0e-4", "≤ +1e-3"].map(String::from)
    );
}
