//! The verification record (issue 22): every external check that goes through [`check`]
//! asserts its tolerance *and* leaves one JSON file under the target directory, and every
//! random-frame property that goes through [`property`] leaves its frame count and worst
//! figure. `tests/verification_record.rs` assembles those files into
//! `docs/verification.md`.
//!
//! One file per id (written whole, then renamed), so test binaries and threads never
//! interleave, and a test that runs twice leaves the same file. The record is complete
//! after a full `cargo test`; `.ci/run` clears it before the suite and regenerates the
//! document after it.

use serde_json::json;
use std::cell::{Cell, RefCell};
use std::panic::Location;
use std::path::PathBuf;

thread_local! {
    /// The source the current test named with [`source`], for the checks its helpers note.
    static SOURCE: RefCell<Option<String>> = const { RefCell::new(None) };
    /// How many checks the current test has noted (numbers the automatic ids).
    static NOTED: Cell<usize> = const { Cell::new(0) };
    /// The largest figure the current test's helpers have [`observe`]d.
    static WORST: Cell<f64> = const { Cell::new(0.0) };
}

/// Keeps the largest figure (a difference over its scale, say) that a property test's
/// helper sees, for [`property`]; read it back with [`observed`].
pub fn observe(figure: f64) {
    WORST.with(|w| w.set(w.get().max(figure)));
}

/// The largest figure [`observe`]d so far in the current test (0 when none).
pub fn observed() -> f64 {
    WORST.with(Cell::get)
}

/// Names the source of the checks that the current test's helpers note with [`note`]
/// from here on (libtest runs each test on its own thread).
pub fn source(text: &str) {
    SOURCE.with(|s| *s.borrow_mut() = Some(text.to_string()));
}

/// The current test's name (libtest names each test's thread after it), `::` as `/`.
fn test_name() -> String {
    std::thread::current()
        .name()
        .unwrap_or("main")
        .replace("::", "/")
}

/// Notes a check made by a test's own helper (which asserts it), when the test has named
/// its [`source`]: the difference is measured against `scale`, the size of the quantity
/// in the problem (|expected| for a plain relative check), and `tol` is the helper's
/// tolerance on that ratio. The id is `file/test/NN quantity`, numbered in call order.
#[track_caller]
pub fn note(quantity: &str, unit: &str, expected: f64, computed: f64, scale: f64, tol: f64) {
    let Some(source) = SOURCE.with(|s| s.borrow().clone()) else {
        return;
    };
    let id = automatic_id(quantity);
    write(
        &id,
        entry(&id, quantity, unit, &source, expected, computed, scale, tol),
    );
}

/// The id of a noted check: `file/test/NN quantity`, the file that of the caller of the
/// test's helper, NN the check's number within the test.
#[track_caller]
fn automatic_id(quantity: &str) -> String {
    let file = Location::caller().file();
    let stem = std::path::Path::new(file)
        .file_stem()
        .and_then(|s| s.to_str())
        .unwrap_or(file);
    let n = NOTED.with(|c| {
        c.set(c.get() + 1);
        c.get()
    });
    format!("{stem}/{}/{n:03} {quantity}", test_name())
}

/// The JSON record of one check.
#[allow(clippy::too_many_arguments)]
fn entry(
    id: &str,
    quantity: &str,
    unit: &str,
    source: &str,
    expected: f64,
    computed: f64,
    scale: f64,
    tol: f64,
) -> serde_json::Value {
    json!({
        "kind": "check",
        "id": id,
        "quantity": quantity,
        "unit": unit,
        "source": source,
        "expected": expected,
        "computed": computed,
        "scale": scale,
        "tolerance": tol,
    })
}

/// The folder of the records: `CARGO_TARGET_TMPDIR/verification`, shared by every
/// integration test binary of the crate.
pub fn record_dir() -> PathBuf {
    PathBuf::from(env!("CARGO_TARGET_TMPDIR")).join("verification")
}

/// Relative difference |computed − expected| / |expected|, or |computed| when the expected
/// value is exactly zero (the checks with a zero expectation state an absolute tolerance).
pub fn relative_difference(expected: f64, computed: f64) -> f64 {
    scaled_difference(expected, computed, expected.abs())
}

/// |computed − expected| / scale, or the plain difference when the scale is zero.
pub fn scaled_difference(expected: f64, computed: f64, scale: f64) -> f64 {
    let d = (computed - expected).abs();
    if scale == 0.0 { d } else { d / scale }
}

/// Writes one record, whole, as `<dir>/<id>.json` (an id's `/` and spaces become `_`).
fn write(id: &str, value: serde_json::Value) {
    let dir = record_dir();
    std::fs::create_dir_all(&dir).expect("verification record folder");
    let stem: String = id
        .chars()
        .map(|c| {
            if c.is_ascii_alphanumeric() || c == '-' || c == '.' {
                c
            } else {
                '_'
            }
        })
        .collect();
    let path = dir.join(format!("{stem}.json"));
    let tmp = dir.join(format!(
        "{stem}.json.{}.{:?}.tmp",
        std::process::id(),
        std::thread::current().id()
    ));
    std::fs::write(&tmp, value.to_string()).expect("write verification record");
    std::fs::rename(&tmp, &path).expect("place verification record");
}

/// One external check: asserts that `computed` lies within the relative tolerance `tol`
/// of `expected` (see [`relative_difference`]) and records it.
///
/// * `id`: unique and stable, `file/test/detail` (it sorts the document);
/// * `quantity`: what is compared, in words, with the case;
/// * `unit`: the unit of `expected` and `computed` as given;
/// * `source`: the standard and clause, the book and section or table, `closed form`
///   (with what it is), or `common practice, no source`, with the confidence tag.
pub fn check(
    id: &str,
    quantity: &str,
    unit: &str,
    source: &str,
    expected: f64,
    computed: f64,
    tol: f64,
) {
    let diff = relative_difference(expected, computed);
    let scale = expected.abs();
    write(
        id,
        entry(id, quantity, unit, source, expected, computed, scale, tol),
    );
    assert!(
        diff <= tol,
        "{id}: {quantity}: computed {computed} {unit}, expected {expected} {unit} \
         ({source}); relative difference {diff:.3e} > {tol:.1e}"
    );
}

/// Records one property over seeded random frames: what it asserts, how many frames it
/// ran on, the worst figure seen and the limit the test holds it to (`figure` names the
/// figure, e.g. "largest equilibrium residual / load scale"). The test asserts the
/// property itself; call this after its loop.
pub fn property(id: &str, asserts: &str, frames: usize, figure: &str, worst: f64, limit: &str) {
    write(
        id,
        json!({
            "kind": "property",
            "id": id,
            "asserts": asserts,
            "frames": frames,
            "figure": figure,
            "worst": worst,
            "limit": limit,
        }),
    );
}

/// A relative check inside a test that named its [`source`]: asserts that `computed` lies
/// within `tol` of `expected`, relative to |expected|, and notes it.
#[track_caller]
pub fn close(quantity: &str, unit: &str, computed: f64, expected: f64, tol: f64) {
    note(quantity, unit, expected, computed, expected.abs(), tol);
    let diff = relative_difference(expected, computed);
    assert!(
        diff <= tol,
        "{quantity}: computed {computed} {unit}, expected {expected} {unit}; \
         relative difference {diff:.3e} > {tol:.1e}"
    );
}

/// A check against the problem's scale inside a test that named its [`source`]: asserts
/// |computed − expected| ≤ `tol`·`scale` and notes it. `scale` is the size of the
/// quantity in the problem (the largest end moment, wL, the load), for quantities that may
/// be zero or that a test compares with an absolute tolerance.
#[track_caller]
pub fn within(quantity: &str, unit: &str, computed: f64, expected: f64, scale: f64, tol: f64) {
    note(quantity, unit, expected, computed, scale, tol);
    let d = (computed - expected).abs();
    assert!(
        d <= tol * scale,
        "{quantity}: computed {computed} {unit}, expected {expected} {unit}; \
         difference {d:.3e} > {tol:.1e} × {scale:.3e}"
    );
}

/// A one- or two-sided bound inside a test that named its [`source`]: asserts
/// `reference + lower·s ≤ computed ≤ reference + upper·s`, with s = |reference| (or 1
/// when the reference is zero, making the bounds absolute), and notes it. An open side is
/// `f64::NEG_INFINITY` or `f64::INFINITY`: `between(q, u, α, 10.0, 0.0, f64::INFINITY)`
/// is α ≥ 10; `between(q, u, x, exact, -5e-3, 1e-3)` is x within −0.5 % and +0.1 % of
/// the exact value (a safe-side estimate).
#[track_caller]
pub fn between(quantity: &str, unit: &str, computed: f64, reference: f64, lower: f64, upper: f64) {
    let s = if reference == 0.0 {
        1.0
    } else {
        reference.abs()
    };
    if let Some(source) = SOURCE.with(|s| s.borrow().clone()) {
        let id = automatic_id(quantity);
        let finite = |x: f64| if x.is_finite() { json!(x) } else { json!(null) };
        let mut e = entry(&id, quantity, unit, &source, reference, computed, s, 0.0);
        e["lower"] = finite(lower);
        e["upper"] = finite(upper);
        write(&id, e);
    }
    let d = (computed - reference) / s;
    assert!(
        d >= lower && d <= upper,
        "{quantity}: computed {computed} {unit}, reference {reference} {unit}; \
         (computed − reference)/{s:.3e} = {d:.3e} outside [{lower:.1e}, {upper:.1e}]"
    );
}

/// A discrete result inside a test that named its [`source`] (a count, a verdict, the
/// member a mode belongs to, a list of names): asserts `computed == expected` and notes
/// it as a text row, tolerance exact.
#[track_caller]
pub fn same<T: PartialEq + std::fmt::Debug>(quantity: &str, expected: T, computed: T) {
    let show = |v: &T| format!("{v:?}").replace('"', "");
    note_text(quantity, "", &show(&expected), &show(&computed), 0.0, 0.0);
    assert_eq!(computed, expected, "{quantity}");
}

/// Notes a check whose values are text (a factored case's factors, say), compared by the
/// test's own helper with the largest numeric `difference` found and its tolerance `tol`.
#[track_caller]
pub fn note_text(
    quantity: &str,
    unit: &str,
    expected: &str,
    computed: &str,
    difference: f64,
    tol: f64,
) {
    let Some(source) = SOURCE.with(|s| s.borrow().clone()) else {
        return;
    };
    let id = automatic_id(quantity);
    write(
        &id,
        json!({
            "kind": "check",
            "id": id,
            "quantity": quantity,
            "unit": unit,
            "source": source,
            "expected_text": expected,
            "computed_text": computed,
            "difference": difference,
            "tolerance": tol,
        }),
    );
}
