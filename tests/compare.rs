//! Issue 23: one model under several variants, side by side. Identity, agreement with a
//! plain `check` of each variant (shipped examples and seeded random frames), and a
//! single-bay frame whose governing factored loads under an ASCE/SEI 7-16 table and an
//! EN 1990 table are worked out by hand.

mod common;

use std::path::Path;

use common::examples;
use common::random_frame::RandomFrame;
use common::verify;
use plumbline::app::{CheckArgs, VariantSpec, parse_variant, run_check, run_compare};
use plumbline::compare::{Comparison, Quantity, VariantRun, compare};
use plumbline::envelope::{Envelope, Location, envelope};
use plumbline::model::SecondOrderMethod;

fn spec(s: &str, n: usize) -> VariantSpec {
    parse_variant(s, n).unwrap()
}

/// The value `check` reports for `quantity` of `member` in its envelope, read directly:
/// the larger-magnitude of the largest positive and negative design moment at a location;
/// the design compression or tension; the larger-magnitude end shear.
fn reported(env: &Envelope, member: &str, quantity: Quantity) -> Option<f64> {
    let moment = |loc: Location| {
        let m = env.members.iter().find(|m| m.member == member)?;
        let s = m.sections.iter().find(|s| s.location == loc)?;
        [&s.positive, &s.negative]
            .into_iter()
            .flatten()
            .map(|d| d.moment)
            .reduce(|a, b| if b.abs() > a.abs() { b } else { a })
    };
    let a = env.axial.iter().find(|a| a.member == member);
    match quantity {
        Quantity::MomentEndI => moment(Location::EndI),
        Quantity::MomentSpan => moment(Location::Span),
        Quantity::MomentEndJ => moment(Location::EndJ),
        Quantity::Compression => a?.compression.as_ref().map(|r| r.axial),
        Quantity::Tension => a?.tension.as_ref().map(|r| r.axial),
        Quantity::Shear => env
            .shear
            .iter()
            .filter(|r| r.member == member)
            .map(|r| r.shear)
            .reduce(|a, b| if b.abs() > a.abs() { b } else { a }),
    }
}

/// Every compared value equals the value of the plain check of its variant.
fn agrees(c: &Comparison, envelopes: &[&Envelope], what: &str) {
    for r in &c.rows {
        for (k, v) in r.values.iter().enumerate() {
            let want = reported(envelopes[k], &r.member, r.quantity);
            assert_eq!(
                v.as_ref().map(|v| v.value),
                want,
                "{what}: {} {} under {}",
                r.member,
                r.quantity,
                c.variants[k]
            );
        }
    }
}

#[test]
fn a_variant_compared_with_itself_changes_nothing() {
    // Identity: two runs of the same check give the same figures, so every ratio is 1
    // exactly and no verdict changes.
    for path in examples() {
        let run = run_compare(&path, &[spec("a:", 1), spec("b:", 2)], &mut |_, _| {}).unwrap();
        let c = &run.comparison;
        assert!(!c.rows.is_empty());
        for r in &c.rows {
            for ratio in r.ratios.iter().flatten() {
                assert_eq!(
                    *ratio,
                    1.0,
                    "{}: {} {}",
                    path.display(),
                    r.member,
                    r.quantity
                );
            }
        }
        assert!(c.stories.iter().all(|s| !s.changed), "{}", path.display());
        assert!(c.headline.largest_increase.is_none() && c.headline.largest_decrease.is_none());
        assert!(c.headline.changed_stories.is_empty());
    }
}

#[test]
fn compared_values_are_those_of_a_plain_check_on_every_example() {
    let variants = [
        "direct: second-order=direct",
        "ec3: second-order=ec3-alpha-cr",
    ];
    for path in examples() {
        let specs: Vec<VariantSpec> = variants
            .iter()
            .enumerate()
            .map(|(k, v)| spec(v, k))
            .collect();
        let run = run_compare(&path, &specs, &mut |_, _| {}).unwrap();
        let plain: Vec<Envelope> = specs
            .iter()
            .map(|s| {
                run_check(&path, &s.check_args(), &mut |_, _| {})
                    .unwrap()
                    .envelope
            })
            .collect();
        let refs: Vec<&Envelope> = plain.iter().collect();
        agrees(&run.comparison, &refs, &path.display().to_string());
        // Story verdicts and deciding figures too.
        for s in &run.comparison.stories {
            for (k, e) in refs.iter().enumerate() {
                let st = e.stories.iter().find(|x| x.story == s.story).unwrap();
                assert_eq!(s.verdicts[k], plumbline::compare::verdict(st));
            }
        }
    }
}

#[test]
fn compared_values_are_those_of_a_plain_check_on_random_frames() {
    // Seeded random frames (irregular bays and stories, releases, base types, braces,
    // leaning columns, tiny, zero and mixed-sign lateral loads) under every method.
    let methods = [
        SecondOrderMethod::AiscB1B2,
        SecondOrderMethod::AciMagnifier,
        SecondOrderMethod::Ec3AlphaCr,
        SecondOrderMethod::Direct,
    ];
    for seed in 0..20 {
        let envelopes: Vec<Envelope> = methods
            .iter()
            .map(|&m| {
                let mut rf = RandomFrame::new(seed);
                rf.model.analysis.method = m;
                envelope(&plumbline::check::check(&rf.model, &rf.cases).unwrap())
            })
            .collect();
        let labels: Vec<String> = methods.iter().map(|m| m.to_string()).collect();
        let runs: Vec<VariantRun> = methods
            .iter()
            .zip(&envelopes)
            .zip(&labels)
            .map(|((&method, envelope), label)| VariantRun {
                label,
                method,
                envelope,
            })
            .collect();
        let c = compare(&runs);
        let refs: Vec<&Envelope> = envelopes.iter().collect();
        agrees(&c, &refs, &format!("seed {seed}"));
        // A ratio is formed only against a significant reference value.
        for r in &c.rows {
            if let (Some(ratio), Some(v0)) = (r.ratios[0], &r.values[0]) {
                assert_eq!(ratio, 1.0);
                assert!(v0.value != 0.0);
            }
        }
    }
}

/// The value of `quantity` of `member` under variant `k`.
fn value(c: &Comparison, member: &str, quantity: Quantity, k: usize) -> f64 {
    c.rows
        .iter()
        .find(|r| r.member == member && r.quantity == quantity)
        .and_then(|r| r.values[k].as_ref())
        .unwrap_or_else(|| panic!("{member} {quantity}"))
        .value
}

#[test]
fn single_bay_frame_under_asce_and_en_tables_by_hand() {
    // tests/fixtures/compare-portal.toml: two cantilever columns (h = 4 m) linked by a beam
    // pinned at both ends (L = 8 m); D = 10 kN/m and S = 8 kN/m (nominal) on the beam, W =
    // 20 kN at the top (strength level, either direction). The model states the
    // conversions snow nominal → characteristic × 0.9 and wind strength → characteristic ×
    // 0.625. α_cr ≈ 200 and no notional loads: the EN 1993-1-1 route is first-order, so by
    // statics the beam's span moment is w·L²/8 and each column's base moment (H/2)·h.
    //
    // ASCE/SEI 7-16 §2.3.1 (from memory, as in combos/asce7-16-strength.toml): the largest
    // gravity load on the beam is combination 3, 1.2D + 1.6S = 24.8 kN/m (1.4D = 14,
    // 1.2D + 1.0W + 0.5S = 16); the largest wind factor is 1.0 (combinations 4 and 5).
    // EN 1990 (6.10) with Table A1.2(B) γG = 1.35, γQ = 1.5 and ψ0 = 0.5 (snow), 0.6
    // (wind) (Table A1.1): snow leading gives 1.35·10 + 1.5·0.9·8 = 24.3 kN/m; the largest
    // wind factor is γQ × 0.625 = 0.9375 (wind leading).
    verify::source(
        "ASCE/SEI 7-16 §2.3.1 and EN 1990:2002 (6.10) with Table A1.2(B), A1.1; by hand",
    );
    let path = Path::new("tests/fixtures/compare-portal.toml");
    let specs = [
        spec("asce:", 1),
        spec("en: combos=en1990-6.10", 2),
        spec("nb: combos=nbcc-2020", 3),
    ];
    let run = run_compare(path, &specs, &mut |_, _| {}).unwrap();
    let c = &run.comparison;
    let (l, h, w_load) = (8.0, 4.0, 20e3);
    let beam = |w: f64| w * l * l / 8.0;
    verify::close(
        "beam span moment wL²/8, ASCE 7-16 governing w = 24.8 kN/m",
        "N·m",
        value(c, "BM", Quantity::MomentSpan, 0),
        beam(24.8e3),
        1e-9,
    );
    verify::close(
        "beam span moment wL²/8, EN 1990 governing w = 24.3 kN/m",
        "N·m",
        value(c, "BM", Quantity::MomentSpan, 1),
        beam(24.3e3),
        1e-9,
    );
    // The beam's axial shortening shifts the columns' shares of H by about
    // (3EI/h³)/(EA/L) = 4.9e6 / 2.6e10 ≈ 2e-4 (statics of the two springs in series).
    for col in ["CA", "CB"] {
        let base = |k| value(c, col, Quantity::MomentEndI, k).abs();
        verify::close(
            &format!("{col} base moment under 1.0W, H·h/2"),
            "N·m",
            base(0),
            1.0 * w_load / 2.0 * h,
            5e-4,
        );
        verify::close(
            &format!("{col} base moment under 0.9375W (EN 1990), H·h/2"),
            "N·m",
            base(1),
            0.9375 * w_load / 2.0 * h,
            5e-4,
        );
    }
    let r = c
        .rows
        .iter()
        .find(|r| r.member == "BM" && r.quantity == Quantity::MomentSpan)
        .unwrap();
    verify::close(
        "ratio of the two tables' span moments 24.3/24.8",
        "-",
        r.ratios[1].unwrap(),
        24.3 / 24.8,
        1e-9,
    );
    verify::same(
        "variant whose span moment governs (ASCE 7-16, 24.8 > 24.3 kN/m)",
        Some(0),
        r.governs,
    );
    // The NBCC table expects specified-level snow and wind, which the model does not
    // convert: that variant is left out with the conversion message, the others run.
    assert_eq!(run.left_out.len(), 1);
    assert_eq!(run.left_out[0].label, "nb");
    assert!(
        run.left_out[0].reason.contains("specified"),
        "{}",
        run.left_out[0].reason
    );
    assert_eq!(c.variants, ["asce", "en"]);
    // No verdict changes: both first-order, α_cr far above 10.
    assert!(c.headline.changed_stories.is_empty());
    assert_eq!(c.headline.members_governed, [3, 0]);
}

#[test]
fn every_format_carries_the_caution_and_the_variants() {
    use plumbline::report::compare::CompareFormat;
    use plumbline::report::export::render_compare as render;
    let path = Path::new("tests/fixtures/compare-portal.toml");
    let run = run_compare(path, &[spec("en: combos=en1990-6.10", 1)], &mut |_, _| {}).unwrap();
    for format in [
        CompareFormat::Table,
        CompareFormat::Json,
        CompareFormat::Csv,
        CompareFormat::Md,
        CompareFormat::Html,
    ] {
        for (name, text) in render(&run.view(), format) {
            assert!(text.contains("licensed engineer"), "{format} {name}");
        }
    }
    let json: serde_json::Value =
        serde_json::from_str(&render(&run.view(), CompareFormat::Json)[0].1).unwrap();
    assert_eq!(json["variants"][0]["label"], "model");
    assert_eq!(json["variants"][1]["label"], "en");
    let html = &render(&run.view(), CompareFormat::Html)[0].1;
    assert!(
        html.contains("class=\"ratio\""),
        "the ratio chart has marks"
    );
    // Default text fits the terminal.
    let text = &render(&run.view(), CompareFormat::Table)[0].1;
    let widest = text.lines().map(|l| l.chars().count()).max().unwrap();
    assert!(widest <= 120, "{widest}");
}

#[test]
fn bad_variants_are_usage_errors() {
    for bad in ["combos", ": combos=x", "x: second-order=nonsense"] {
        assert!(parse_variant(bad, 1).is_err(), "{bad}");
    }
    let path = Path::new("tests/fixtures/compare-portal.toml");
    let e = run_compare(
        path,
        &[spec("a:", 1), spec("a: combos=en1990-6.10", 2)],
        &mut |_, _| {},
    );
    assert!(e.is_err(), "duplicate labels are refused");
    let _ = CheckArgs::default();
}
