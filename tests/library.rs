//! The library's entry points (`plumbline::api`, issue 22 item 2): they give what the command
//! line gives, and bad frames built in code are typed errors, never panics.
//!
//! The engineering of the figures is tested by the stage tests (`second_order.rs`,
//! `amplifier_validity.rs`, …); here the check is that the library reaches the same figures
//! by the same steps as `plumbline check`.

mod common;

use common::examples;
use common::verify;
use std::path::Path;

use plumbline::app::{CheckArgs, run_check};
use plumbline::{ActionCategory, Check, Error, FrameBuilder, LoadLevel, SecondOrderMethod};

/// `check_file` gives every example the cases, member envelopes and story envelopes of
/// `plumbline check` (the strength half of `app::run_check`).
#[test]
fn check_file_matches_the_command_line_on_every_example() {
    for path in examples() {
        let ours = plumbline::check_file(&path).unwrap();
        let cli = run_check(&path, &CheckArgs::default(), &mut |_, _| {}).unwrap();
        let name = path.display();
        assert_eq!(ours.cases.len(), cli.cases.len(), "{name}: factored cases");
        assert_eq!(
            ours.envelope.members, cli.envelope.members,
            "{name}: members"
        );
        assert_eq!(
            ours.envelope.stories, cli.envelope.stories,
            "{name}: stories"
        );
        assert_eq!(ours.envelope.reactions, cli.envelope.reactions, "{name}");
        assert_eq!(ours.envelope.unstable, cli.envelope.unstable, "{name}");
        assert_eq!(ours.caution(), plumbline::CAUTION);
    }
}

/// `Check::table` and `Check::method` act as `--combos` and `--method` do (the model's
/// level conversions and its own table's levels apply as on the command line).
#[test]
fn table_method_and_parameters_match_the_command_line() {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/office-3story.toml");
    let model = plumbline::read_model(&path).unwrap();
    let ours = Check::new(&model)
        .table("en1990-6.10")
        .method(SecondOrderMethod::Direct)
        .base_dir(path.parent().unwrap())
        .run()
        .unwrap();
    let args = CheckArgs {
        combos: Some("en1990-6.10".into()),
        method: Some(SecondOrderMethod::Direct),
        ..CheckArgs::default()
    };
    let cli = run_check(&path, &args, &mut |_, _| {}).unwrap();
    assert_eq!(ours.table.file, cli.table.file);
    assert_eq!(ours.envelope.members, cli.envelope.members);
    assert_eq!(
        ours.governing(),
        plumbline::envelope::governing(&cli.envelope.members)
    );
}

/// An invented portal with a dead, a roof live and a reversible wind case.
fn portal() -> FrameBuilder {
    let mut f = FrameBuilder::new("invented portal");
    f.material("steel", 200e9)
        .section("col", 6.0e-3, 8.0e-5)
        .section("beam", 7.0e-3, 1.5e-4)
        .node("A", 0.0, 0.0)
        .node("B", 0.0, 4.0)
        .node("C", 8.0, 4.0)
        .node("D", 8.0, 0.0)
        .member("C1", "A", "B", "steel", "col")
        .member("B1", "B", "C", "steel", "beam")
        .member("C2", "D", "C", "steel", "col")
        .fixed("A")
        .fixed("D")
        .case("D", ActionCategory::Dead)
        .line_load("D", "B1", 12e3)
        .case("Lr", ActionCategory::RoofLive)
        .line_load("Lr", "B1", 5e3)
        .case("W", ActionCategory::Wind)
        .level("W", LoadLevel::Strength)
        .reversible("W")
        .node_load("W", "B", 7.5e3, 0.0)
        .node_load("W", "C", 7.5e3, 0.0);
    f
}

/// A built portal checks, and a symmetric frame under symmetric gravity gives the two
/// columns governing moments of equal size (closed form: symmetry).
#[test]
fn built_portal_checks_and_is_symmetric() {
    let model = portal().build().unwrap();
    let out = Check::new(&model).table("asce7-16-strength").run().unwrap();
    assert!(out.is_stable());
    let g = out.governing();
    assert_eq!(g.len(), 3);
    let (c1, c2) = (&g[0], &g[2]);
    assert_eq!((c1.member.as_str(), c2.member.as_str()), ("C1", "C2"));
    // Wind shared equally by both column tops and reversed, and notional loads in both
    // directions, make the set of cases its own mirror image: |M| equal to a tolerance on
    // the largest moment (the iterated second-order analysis converges to 1e-8 or so).
    let scale = g.iter().map(|m| m.moment.abs()).fold(0.0, f64::max);
    verify::source("closed form: symmetry of the frame and of its set of cases");
    verify::within(
        "|M| of C2's governing moment against C1's, against the largest governing moment",
        "N·m",
        c2.moment.abs(),
        c1.moment.abs(),
        scale,
        1e-6,
    );
    assert_eq!(out.story_verdicts().len(), 1);
}

/// A change that spoils a frame under construction.
type Spoil = Box<dyn Fn(&mut FrameBuilder)>;

/// Every inconsistency of a frame built in code is an `Error::Build` naming it.
#[test]
fn bad_frames_are_typed_errors() {
    let cases: Vec<(&str, Spoil)> = vec![
        (
            "no node X",
            Box::new(|f| {
                f.member("M9", "A", "X", "steel", "col");
            }),
        ),
        (
            "no material",
            Box::new(|f| {
                f.member("M9", "A", "C", "wood", "col");
            }),
        ),
        (
            "no section",
            Box::new(|f| {
                f.member("M9", "A", "C", "steel", "none");
            }),
        ),
        (
            "declared twice",
            Box::new(|f| {
                f.node("A", 1.0, 1.0);
            }),
        ),
        (
            "zero length",
            Box::new(|f| {
                f.node("E", 0.0, 0.0).member("M9", "A", "E", "steel", "col");
            }),
        ),
        (
            "positive finite",
            Box::new(|f| {
                f.section("bad", 0.0, 1e-4);
            }),
        ),
        (
            "positive finite",
            Box::new(|f| {
                f.material("bad", f64::NAN);
            }),
        ),
        (
            "no load case Q",
            Box::new(|f| {
                f.line_load("Q", "B1", 1e3);
            }),
        ),
        (
            "no member B9",
            Box::new(|f| {
                f.line_load("D", "B9", 1e3);
            }),
        ),
        (
            "must be finite",
            Box::new(|f| {
                f.node_load("D", "B", f64::INFINITY, 0.0);
            }),
        ),
        (
            "no load case Z",
            Box::new(|f| {
                f.reversible("Z");
            }),
        ),
    ];
    for (expected, spoil) in cases {
        let mut f = portal();
        spoil(&mut f);
        match f.build() {
            Err(Error::Build { message, .. }) => {
                assert!(message.contains(expected), "{message:?} lacks {expected:?}")
            }
            other => panic!("{expected}: expected a build error, got {other:?}"),
        }
    }
}

/// A frame that cannot be analysed, a missing table and a serviceability table are errors.
#[test]
fn requests_that_cannot_run_are_errors() {
    let model = portal().build().unwrap();
    assert!(matches!(Check::new(&model).run(), Err(Error::Request(_))));
    assert!(matches!(
        Check::new(&model).table("asce7-16-service").run(),
        Err(Error::Request(_))
    ));
    assert!(matches!(
        Check::new(&model).table("no-such-table").run(),
        Err(Error::File(_))
    ));
    // Both bases pinned and the beam pinned at one end: a mechanism.
    let mut f = FrameBuilder::new("mechanism");
    f.material("steel", 200e9)
        .section("s", 6.0e-3, 8.0e-5)
        .node("A", 0.0, 0.0)
        .node("B", 0.0, 4.0)
        .node("C", 8.0, 4.0)
        .node("D", 8.0, 0.0)
        .member("C1", "A", "B", "steel", "s")
        .member("B1", "B", "C", "steel", "s")
        .member("C2", "D", "C", "steel", "s")
        .release("B1", true, true)
        .pinned("A")
        .pinned("D")
        .case("D", ActionCategory::Dead)
        .line_load("D", "B1", 1e3);
    let model = f.build().unwrap();
    let out = Check::new(&model).table("asce7-16-strength").run();
    assert!(matches!(out, Err(Error::Analysis { .. })), "{out:?}");
}
