//! Buckling modes sorted into sway and member modes, and critical load factors on the safe
//! side of the mesh error (`SecondOrderModel::buckling`). Each check names its source beside
//! it.

mod common;

use std::f64::consts::PI;

use common::{Frame, portal, verify};
use plumbline::model::{ActionCategory, LoadDirection, Measure, MemberLoadKind, Restraint};
use plumbline::solve::linear::MeshLoads;
use plumbline::solve::mesh::member_stiffness;
use plumbline::solve::modes::{FrameBuckling, ModeKind, SwaySearch};
use plumbline::solve::second_order::{SecondOrderModel, element_axial};

const E: f64 = 210e9; // Pa, steel (common practice, no source)
/// m²: members axially rigid, so closed forms that neglect shortening apply.
const RIGID_A: f64 = 10.0;

/// The model's mesh with `segments` elements per member and the loads of `case` on it.
fn setup(f: &Frame, case: usize, segments: usize) -> (SecondOrderModel, MeshLoads) {
    let st = member_stiffness(&f.model);
    let so = SecondOrderModel::new(&f.model, &st, segments).unwrap();
    let mut loads = MeshLoads::zero(&so.mesh);
    loads.add_case(&f.model, &so.mesh, case, 1.0);
    (so, loads)
}

/// Buckling analysis of load case `case` with `segments` elements per member.
fn buckling(f: &Frame, case: usize, segments: usize) -> FrameBuckling {
    let (so, loads) = setup(f, case, segments);
    so.buckling(&f.model, &loads)
        .unwrap()
        .expect("something is in compression")
}

/// The sway factor, which must exist.
fn sway(b: &FrameBuckling) -> f64 {
    b.sway.as_ref().expect("a sway mode").alpha_cr
}

/// The modes, for the test log.
fn show(name: &str, b: &FrameBuckling) {
    eprintln!(
        "{name}: segments {:?}, {:?}, sway {:?}, member {:?}",
        b.segments,
        b.search,
        b.sway.as_ref().map(|s| s.alpha_cr),
        b.member.as_ref().map(|m| (m.member, m.alpha_cr))
    );
    for m in &b.modes {
        eprintln!(
            "   {:>12.6} (mesh {:>12.6}, nested {:>12.6}) {:?} ρ/β {:.3}",
            m.alpha_cr,
            m.alpha_mesh,
            m.alpha_refined.unwrap_or(f64::NAN),
            m.kind,
            m.chord_rotation / m.bow
        );
    }
}

/// Root of `f` on `[lo, hi]` by bisection (f(lo) and f(hi) of opposite signs).
fn root(f: impl Fn(f64) -> f64, mut lo: f64, mut hi: f64) -> f64 {
    let flo = f(lo);
    assert!(flo * f(hi) < 0.0, "no sign change on [{lo}, {hi}]");
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if (f(mid) > 0.0) == (flo > 0.0) {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

/// ρ/β of a mode summary.
fn ratio(m: &plumbline::solve::modes::ModeSummary) -> f64 {
    m.chord_rotation / m.bow
}

/// Portal 8 m × 4 m with fixed bases and a (nearly) rigid beam (I = 10⁴·Ic), columns `ic`
/// each carrying `p_col`, and a pin-ended leaning post 4 m tall (I = 400 cm⁴) 4 m to the
/// right carrying `p_post`, tied to the portal's top right node by a link pinned at both
/// ends. Returns the frame, the load case and the post's member index.
fn portal_with_post(ic: f64, p_col: f64, p_post: f64) -> (Frame, usize, usize) {
    let (h, l) = (4.0, 8.0);
    let mut f = Frame::new();
    let n0 = f.node(0.0, 0.0);
    let n1 = f.node(0.0, h);
    let n2 = f.node(l, h);
    let n3 = f.node(l, 0.0);
    let n4 = f.node(l + 4.0, 0.0);
    let n5 = f.node(l + 4.0, h);
    f.member(n0, n1, E, RIGID_A, ic);
    f.member(n1, n2, E, RIGID_A, 1e4 * ic);
    f.member(n3, n2, E, RIGID_A, ic);
    let post = f.member(n4, n5, E, RIGID_A, 400e-8);
    let link = f.member(n2, n5, E, RIGID_A, 1e-4);
    f.release(link, true, true);
    f.fixed(n0);
    f.fixed(n3);
    f.pinned(n4);
    let c = f.case("D", ActionCategory::Dead);
    f.nodal(c, n1, 0.0, -p_col, 0.0);
    f.nodal(c, n2, 0.0, -p_col, 0.0);
    f.nodal(c, n5, 0.0, -p_post, 0.0);
    (f, c, post)
}

/// Closed form for the sway of [`portal_with_post`] (derived here). With a rigid beam each
/// fixed-base column is held against rotation at both ends; by antisymmetry it is two
/// cantilevers of length a = h/2 from its inflection point at mid-height, whose tip
/// deflection Δ/2 under a lateral force H and axial force P is H·(tan ka − ka)/(P·k),
/// k = √(P/EI) (Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., §1.11, from
/// memory; the AISC 360-16 Commentary Case 2 formula of `tests/second_order.rs`). So a
/// column resists H = P·k·(Δ/2)/(tan ka − ka). The straight leaning post needs a lateral
/// force P_post·Δ/h at its top. Sway buckling: 2·H(α·p_col) = α·p_post·Δ/h, solved for α
/// below the columns' own sway load π²EI/h² (ka = π/2), where the root is unique.
fn portal_with_post_sway(ic: f64, p_col: f64, p_post: f64) -> f64 {
    let h = 4.0;
    let resist = |alpha: f64| {
        let p = alpha * p_col;
        let k = (p / (E * ic)).sqrt();
        let a = 0.5 * h;
        2.0 * p * k * 0.5 / ((k * a).tan() - k * a) - alpha * p_post / h
    };
    let alpha_max = PI * PI * E * ic / (h * h) / p_col;
    root(resist, 1e-6 * alpha_max, alpha_max * (1.0 - 1e-12))
}

#[test]
fn a_leaning_post_buckles_as_a_member_mode_far_below_the_frame_sway() {
    let (ic, p_col, p_post) = (2.5e-4, 200e3, 97e3);
    let (f, c, post) = portal_with_post(ic, p_col, p_post);
    let b = buckling(&f, c, 4);
    show("portal + leaning post", &b);
    // Euler load of the pin-ended post over its load, π²EI/(L²·N) (Timoshenko & Gere,
    // Theory of Elastic Stability, 2nd ed., §2.1, from memory): 5.342.
    let euler = PI * PI * E * 400e-8 / 16.0 / p_post;
    let member = b
        .member
        .as_ref()
        .expect("a member mode below the sway mode");
    verify::source("Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., §2.1 (from memory)");
    verify::same(
        "member of the lowest member mode (the post)",
        post,
        member.member,
    );
    verify::check(
        "buckling_modes/leaning-post/member-mode",
        "α_cr of a pin-ended leaning post's member mode, π²EI/(L²·N)",
        "-",
        "Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., §2.1 (from memory)",
        euler,
        member.alpha_cr,
        1e-3,
    );
    verify::between(
        "the post's member-mode factor, on the safe side of the Euler value",
        "-",
        member.alpha_cr,
        euler,
        f64::NEG_INFINITY,
        1e-3,
    );
    // The raw lowest mode, as before, is the post's.
    let (so, loads) = setup(&f, c, 4);
    let lowest = so.critical_factor(&f.model, &loads).unwrap().unwrap();
    assert!((lowest.alpha_cr - b.modes[0].alpha_mesh).abs() <= 1e-6 * lowest.alpha_cr);
    // The sway mode, against the closed form of `portal_with_post_sway` (135.27).
    let exact = portal_with_post_sway(ic, p_col, p_post);
    eprintln!("sway closed form {exact:.4}, Euler {euler:.4}");
    let alpha = sway(&b);
    verify::source(
        "common practice, no source: the frame's sway mode lies far above the post's own",
    );
    verify::between(
        "sway-mode factor, above 20 × the post's member-mode factor",
        "-",
        alpha,
        20.0 * member.alpha_cr,
        0.0,
        f64::INFINITY,
    );
    verify::check(
        "buckling_modes/leaning-post/sway-mode",
        "α_cr of the sway mode of a portal with a leaning post",
        "-",
        "closed form from Timoshenko & Gere §1.11 (from memory): 2·H(α·P_col) = α·P_post·Δ/h",
        exact,
        alpha,
        2e-3,
    );
    verify::source(
        "closed form from Timoshenko & Gere §1.11 (from memory): 2·H(α·P_col) = α·P_post·Δ/h",
    );
    verify::between(
        "sway-mode factor, within −0.2 % and +0.1 % of the closed form",
        "-",
        alpha,
        exact,
        -2e-3,
        1e-3,
    );
    assert_eq!(b.search, SwaySearch::Complete);
    // The post's higher modes (about 4, 9 and 16 times its Euler load, Timoshenko & Gere
    // §2.1: n² for the n-th mode of a pin-ended column) lie between them, all its own.
    let members: Vec<&plumbline::solve::modes::ModeSummary> = b
        .modes
        .iter()
        .filter(|m| m.kind != ModeKind::Sway)
        .collect();
    assert_eq!(members.len(), 4);
    for (n, m) in members.iter().enumerate() {
        verify::source(
            "Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., §2.1 (from memory)",
        );
        verify::same(
            &format!("owner of member mode {}", n + 1),
            ModeKind::Member { member: post },
            m.kind,
        );
        let k = (n + 1) as f64;
        // The nested mesh (8 elements) is within 1 % of n²·Euler for the first four.
        let nested = m.alpha_refined.expect("nested mesh");
        verify::close(
            &format!("mode {} of the post, nested mesh, n²·π²EI/(L²·N)", n + 1),
            "-",
            nested,
            k * k * euler,
            0.01,
        );
        // The post's chord does not turn: ρ/β is round-off.
        verify::source(
            "closed form: the bow of a post pinned at both ends leaves its chord in place",
        );
        verify::between(
            &format!(
                "mode {} of the post: chord rotation / bow (the chord does not turn)",
                n + 1
            ),
            "-",
            ratio(m),
            0.0,
            f64::NEG_INFINITY,
            1e-3,
        );
    }
    let last = b.modes.last().unwrap();
    verify::source("measured for the classification threshold (module documentation), no source");
    verify::same("kind of the last mode", ModeKind::Sway, last.kind);
    // Measured for the classification threshold (module documentation): about 9.8.
    verify::between(
        "sway mode: chord rotation / bow, above 5",
        "-",
        ratio(last),
        5.0,
        0.0,
        f64::INFINITY,
    );
}

#[test]
fn two_identical_posts_give_double_member_modes_all_found_below_the_sway() {
    // The portal of the previous test with a second, identical post on the left: every bow
    // of the posts is a double eigenvalue (two uncoupled, identical pin-ended columns;
    // closed form n²·π²EI/(L²·N), Timoshenko & Gere §2.1, from memory). The Sturm count
    // confirms that none was missed below the sway mode.
    let (mut f, c, post) = portal_with_post(2.5e-4, 200e3, 97e3);
    let nl = f.node(-4.0, 0.0);
    let nt = f.node(-4.0, 4.0);
    let other = f.member(nl, nt, E, RIGID_A, 400e-8);
    let link = f.member(nt, 1, E, RIGID_A, 1e-4);
    f.release(link, true, true);
    f.pinned(nl);
    f.nodal(c, nt, 0.0, -97e3, 0.0);
    let b = buckling(&f, c, 4);
    show("portal + two posts", &b);
    assert_eq!(b.search, SwaySearch::Complete);
    let euler = PI * PI * E * 400e-8 / 16.0 / 97e3;
    let members: Vec<_> = b
        .modes
        .iter()
        .filter(|m| m.kind != ModeKind::Sway)
        .collect();
    assert_eq!(members.len(), 8);
    verify::source(
        "closed form: two uncoupled identical pin-ended columns give double eigenvalues (Timoshenko & Gere §2.1, from memory)",
    );
    for (n, pair) in members.chunks(2).enumerate() {
        verify::close(
            &format!(
                "mode pair {}: second factor against the first (mesh)",
                n + 1
            ),
            "-",
            pair[1].alpha_mesh,
            pair[0].alpha_mesh,
            1e-8,
        );
        let owners = [pair[0].kind, pair[1].kind];
        assert!(owners.contains(&ModeKind::Member { member: post }));
        assert!(owners.contains(&ModeKind::Member { member: other }));
    }
    verify::check(
        "buckling_modes/two-posts/member-mode",
        "α_cr of the lowest (double) member mode of two identical leaning posts",
        "-",
        "Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., §2.1 (from memory)",
        euler,
        members[0].alpha_cr,
        1e-3,
    );
    // The sway mode carries both posts' P-Δ: lower than with one post, still far above.
    verify::source(
        "common practice, no source: the frame's sway mode lies far above the posts' own",
    );
    verify::between(
        "sway-mode factor, above 20 × a post's Euler factor",
        "-",
        sway(&b),
        20.0 * euler,
        0.0,
        f64::INFINITY,
    );
}

/// Fixed-base portal h = L = 4 m, Ib = Ic (GB = 1), equal column loads: the sway
/// coefficient c of Pcr = c·EIc/h² from the alignment-chart equation of AISC 360-16
/// Commentary App. 7 (C-A-7-2; reference notes §10.2 [C]), exact for this frame (notes
/// [X]): (GA·GB·x² − 36)/(6(GA + GB)) = x/tan x with x = π/K, c = x². Fixed base: GA = 0,
/// so −6/GB = x/tan x, x in (π/2, π). Pinned base: GA → ∞, so GB·x²/6 = x/tan x, i.e.
/// x·tan x = 6/GB, x in (0, π/2).
fn chart_coefficient(fixed: bool) -> f64 {
    let gb = 1.0;
    let x = if fixed {
        root(|x| x / x.tan() + 6.0 / gb, PI / 2.0 + 1e-9, PI - 1e-9)
    } else {
        root(|x| x * x.tan() - 6.0 / gb, 1e-9, PI / 2.0 - 1e-9)
    };
    x * x
}

#[test]
fn factors_are_on_the_safe_side_of_the_mesh_error_from_two_elements_on() {
    // Closed forms: pin-ended column Pcr = π²EI/L² (a member mode: its ends do not
    // translate), fixed–free column Pcr = π²EI/(4L²) (a sway mode), Timoshenko & Gere
    // §2.1–2.3 (from memory); single-bay portals with GB = 1 from the alignment-chart
    // equation (`chart_coefficient`). Every mesh factor is above the exact one (Rayleigh–Ritz
    // upper bound, module documentation) and every reported factor at most 0.1 % above it.
    let (i, l, p) = (8e-5, 5.0, 1000.0);
    let column = |top: [Restraint; 3], bottom: [Restraint; 3]| {
        let mut f = Frame::new();
        let n0 = f.node(0.0, 0.0);
        let n1 = f.node(0.0, l);
        f.member(n0, n1, E, RIGID_A, i);
        f.support(n0, bottom);
        f.support(n1, top);
        let c = f.case("P", ActionCategory::Dead);
        f.nodal(c, n1, 0.0, -p, 0.0);
        (f, c)
    };
    let pinned = [Restraint::Fixed, Restraint::Fixed, Restraint::Free];
    let roller = [Restraint::Fixed, Restraint::Free, Restraint::Free];
    let ei = E * i;
    let portal_case = |fixed: bool| {
        let (mut f, [_, n1, n2, _, _, _, _]) = portal(4.0, 4.0, 1e-4, 1e-4, fixed);
        let c = f.case("P", ActionCategory::Dead);
        f.nodal(c, n1, 0.0, -1000.0, 0.0);
        f.nodal(c, n2, 0.0, -1000.0, 0.0);
        (f, c)
    };
    let portal_exact = |fixed: bool| chart_coefficient(fixed) * 200e9 * 1e-4 / 16.0 / 1000.0;
    verify::source(
        "Timoshenko & Gere §2.1–2.3 (from memory): π²EI/L², π²EI/(4L²); AISC 360-16 Commentary App. 7 eq. C-A-7-2 (reference notes §10.2 [C]) for the portals",
    );
    eprintln!("case                segments   reported        mesh          exact     error %");
    for segments in [2, 3, 4, 8] {
        let cases: Vec<(&str, FrameBuckling, f64, bool)> = vec![
            {
                let (f, c) = column(roller, pinned);
                (
                    "pinned column",
                    buckling(&f, c, segments),
                    PI * PI * ei / (l * l) / p,
                    false,
                )
            },
            {
                let (f, c) = column([Restraint::Free; 3], [Restraint::Fixed; 3]);
                (
                    "cantilever",
                    buckling(&f, c, segments),
                    PI * PI * ei / (4.0 * l * l) / p,
                    true,
                )
            },
            {
                let (f, c) = portal_case(true);
                (
                    "fixed-base portal",
                    buckling(&f, c, segments),
                    portal_exact(true),
                    true,
                )
            },
            {
                let (f, c) = portal_case(false);
                (
                    "pinned-base portal",
                    buckling(&f, c, segments),
                    portal_exact(false),
                    true,
                )
            },
        ];
        for (name, b, exact, is_sway) in cases {
            let (reported, mesh) = if is_sway {
                let k = b
                    .modes
                    .iter()
                    .position(|m| m.kind == ModeKind::Sway)
                    .unwrap();
                (sway(&b), b.modes[k].alpha_mesh)
            } else {
                verify::same(
                    &format!(
                        "{name}, {segments} elements: a sway mode (the ends do not translate)"
                    ),
                    false,
                    b.sway.is_some(),
                );
                (b.member.as_ref().unwrap().alpha_cr, b.modes[0].alpha_mesh)
            };
            eprintln!(
                "{name:<20} {segments:>4} {reported:>14.4} {mesh:>14.4} {exact:>12.4} {:>+9.4}",
                100.0 * (reported / exact - 1.0)
            );
            // (The portals' axially almost rigid members, A = 10 m², move the factor by
            // about 10⁻⁶ from the chart's inextensible frame.)
            verify::between(
                &format!("{name}, {segments} elements: mesh factor, not below the exact one"),
                "-",
                mesh,
                exact,
                -1e-5,
                f64::INFINITY,
            );
            verify::between(
                &format!("{name}, {segments} elements: reported factor, at most 0.1 % above"),
                "-",
                reported,
                exact,
                -5e-3,
                1e-3,
            );
        }
    }
}

#[test]
fn a_column_under_its_own_weight_is_reported_below_its_buckling_load() {
    // A fixed–free column under a uniform axial load q along its length (N growing linearly
    // to the base) buckles at (qL)cr = 7.837·EI/L² (Timoshenko & Gere, Theory of Elastic
    // Stability, 2nd ed., §2.10, from memory). Each element takes the mean of its axial
    // force, so the mesh factors converge from below (module documentation): the model
    // mesh's factor is reported, below the closed form. The nested mesh takes its axial
    // forces from the model mesh's first-order solution by statics; its factor must equal
    // that of the 2n-element mesh analysed on its own (a second computation of the same
    // problem).
    let (i, l, q) = (8e-5, 5.0, 1000.0);
    let mut f = Frame::new();
    let n0 = f.node(0.0, 0.0);
    let n1 = f.node(0.0, l);
    let m = f.member(n0, n1, E, RIGID_A, i);
    f.fixed(n0);
    let c = f.case("G", ActionCategory::Dead);
    f.member_load(
        c,
        m,
        MemberLoadKind::Distributed {
            a: 0.0,
            b: l,
            w_a: -q,
            w_b: -q,
            direction: LoadDirection::LocalX,
            measure: Measure::AlongMember,
        },
    );
    let exact = 7.837 * E * i / (l * l) / (q * l);
    verify::source("Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., §2.10 (from memory)");
    let mut last = 0.0;
    for segments in [2, 4, 8, 16] {
        let b = buckling(&f, c, segments);
        show("column under its own weight", &b);
        let alpha = sway(&b);
        eprintln!(
            "{segments} elements: {:+.3} %",
            100.0 * (alpha / exact - 1.0)
        );
        verify::between(
            &format!("{segments} elements: reported factor, not above (qL)cr = 7.837·EI/L²"),
            "-",
            alpha,
            exact,
            f64::NEG_INFINITY,
            1e-3,
        );
        verify::source("module documentation: the mesh factors converge from below");
        verify::between(
            &format!("{segments} elements: factor, above the coarser mesh's"),
            "-",
            alpha,
            last,
            0.0,
            f64::INFINITY,
        );
        verify::source(
            "Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., §2.10 (from memory)",
        );
        last = alpha;
        if segments < 16 {
            assert_eq!(alpha, b.modes[0].alpha_mesh);
            let (so, loads) = setup(&f, c, 2 * segments);
            let own = so
                .critical_factor(&f.model, &loads)
                .unwrap()
                .unwrap()
                .alpha_cr;
            let nested = b.modes[0].alpha_refined.unwrap();
            verify::source("a second computation: the 2n-element mesh analysed on its own");
            verify::close(
                &format!(
                    "{segments} elements: nested-mesh factor against {} elements",
                    2 * segments
                ),
                "-",
                nested,
                own,
                1e-6,
            );
            verify::source(
                "Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., §2.10 (from memory)",
            );
        }
    }
    // 16 elements: within 0.2 % below (an error falling like h², 10 % at two elements).
    verify::check(
        "buckling_modes/own-weight/16-elements",
        "α_cr of a fixed–free column under its own weight, (qL)cr = 7.837·EI/L², 16 elements",
        "-",
        "Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., §2.10 (from memory)",
        exact,
        last,
        2e-3,
    );
    assert!(last >= exact * (1.0 - 2e-3), "{last}");
}

/// One-bay frame 6 m × 4 m on pinned bases, rigid joints (Ic = 1e-4, Ib = 2e-4 m⁴), with a
/// pin-ended diagonal brace from the left base to the right top (A = 20 cm²,
/// I = 400 cm⁴), column tops carrying 100 kN each and 60 kN to the left at the left top,
/// which compresses the brace.
fn braced_portal() -> (Frame, usize, usize) {
    let mut f = Frame::new();
    let n0 = f.node(0.0, 0.0);
    let n1 = f.node(0.0, 4.0);
    let n2 = f.node(6.0, 4.0);
    let n3 = f.node(6.0, 0.0);
    f.member(n0, n1, E, RIGID_A, 1e-4);
    f.member(n1, n2, E, RIGID_A, 2e-4);
    f.member(n3, n2, E, RIGID_A, 1e-4);
    let brace = f.member(n0, n2, E, 20e-4, 400e-8);
    f.release(brace, true, true);
    f.pinned(n0);
    f.pinned(n3);
    let c = f.case("D+W", ActionCategory::Dead);
    f.nodal(c, n1, -60e3, -100e3, 0.0);
    f.nodal(c, n2, 0.0, -100e3, 0.0);
    (f, c, brace)
}

/// First-order axial force (N, tension positive) of member `m` under `case`.
fn axial_force(f: &Frame, case: usize, m: usize) -> f64 {
    let (so, loads) = setup(f, case, 4);
    let r = so.first_order(&f.model, &loads).unwrap();
    element_axial(&r)[so.mesh.member_elements[m].start]
}

#[test]
fn a_slender_pin_ended_brace_bows_first_and_the_sway_mode_is_far_higher() {
    let (f, c, brace) = braced_portal();
    let n = axial_force(&f, c, brace);
    assert!(n < 0.0, "the brace is in compression");
    // Euler load of the pin-ended brace (L² = 6² + 4²) over its first-order force
    // (Timoshenko & Gere §2.1, from memory); the frame holds its ends almost rigidly.
    let euler = PI * PI * E * 400e-8 / 52.0 / -n;
    verify::source("Timoshenko & Gere §2.1 (from memory): Euler load of the pin-ended brace");
    for segments in [2, 4, 8] {
        let b = buckling(&f, c, segments);
        show(&format!("braced frame, {segments} elements"), &b);
        assert_eq!(b.search, SwaySearch::Complete);
        let member = b.member.as_ref().expect("the brace bows first");
        verify::same(
            &format!("{segments} elements: member of the lowest member mode (the brace)"),
            brace,
            member.member,
        );
        verify::between(
            &format!("{segments} elements: the brace's factor, π²EI/(L²·N)"),
            "-",
            member.alpha_cr,
            euler,
            -3e-3,
            1e-3,
        );
        // The released ends of the compressed brace are exact in the pencil: the mesh
        // factor is the Rayleigh–Ritz upper bound of the brace's Euler load.
        verify::between(
            &format!("{segments} elements: the brace's mesh factor, an upper bound"),
            "-",
            b.modes[0].alpha_mesh,
            euler,
            -1e-4,
            f64::INFINITY,
        );
        // The sway mode needs the brace to stretch: more than a hundred times higher.
        verify::source(
            "common practice, no source: the sway mode needs the brace to stretch, far above its bow",
        );
        verify::between(
            &format!("{segments} elements: sway-mode factor, above 100 × the brace's"),
            "-",
            sway(&b),
            100.0 * member.alpha_cr,
            0.0,
            f64::INFINITY,
        );
        verify::source("Timoshenko & Gere §2.1 (from memory): Euler load of the pin-ended brace");
        assert!(
            b.modes[..b.modes.len() - 1]
                .iter()
                .all(|m| m.kind != ModeKind::Sway)
        );
    }
    // The sway factor at 4 elements against the 16-element mesh (converged to 10⁻⁵: the
    // mesh error falls like h⁴, module documentation).
    let b4 = buckling(&f, c, 4);
    let b16 = buckling(&f, c, 16);
    let (s4, s16) = (sway(&b4), sway(&b16));
    verify::source(
        "the 16-element mesh, converged to 1e-5 (mesh error like h⁴, module documentation)",
    );
    verify::between(
        "sway factor at 4 elements against 16",
        "-",
        s4,
        s16,
        -2e-3,
        1e-3,
    );
}

#[test]
fn a_three_bay_frame_with_a_leaning_column_and_a_brace() {
    // Three bays of 6 m, 4 m high, fixed bases; a leaning column (I = 300 cm⁴) 6 m to the
    // right, tied by a pinned link; a pin-ended brace (I = 150 cm⁴) across the first bay;
    // 300 kN on each column, 150 kN on the leaning column, 40 kN to the left at the top
    // left. Sources: Euler loads of the brace and of the leaning column over their
    // first-order forces (Timoshenko & Gere §2.1, from memory); the sway factor against the
    // 16-element mesh.
    let mut f = Frame::new();
    let base: Vec<usize> = (0..4).map(|k| f.node(6.0 * k as f64, 0.0)).collect();
    let top: Vec<usize> = (0..4).map(|k| f.node(6.0 * k as f64, 4.0)).collect();
    let lean_base = f.node(24.0, 0.0);
    let lean_top = f.node(24.0, 4.0);
    for k in 0..4 {
        f.member(base[k], top[k], E, RIGID_A, 1.2e-4);
        f.fixed(base[k]);
    }
    for k in 0..3 {
        f.member(top[k], top[k + 1], E, RIGID_A, 3e-4);
    }
    let lean = f.member(lean_base, lean_top, E, RIGID_A, 300e-8);
    let link = f.member(top[3], lean_top, E, RIGID_A, 1e-4);
    f.release(link, true, true);
    f.pinned(lean_base);
    let brace = f.member(base[0], top[1], E, 15e-4, 150e-8);
    f.release(brace, true, true);
    let c = f.case("D+W", ActionCategory::Dead);
    for (k, &t) in top.iter().enumerate() {
        f.nodal(c, t, if k == 0 { -40e3 } else { 0.0 }, -300e3, 0.0);
    }
    f.nodal(c, lean_top, 0.0, -150e3, 0.0);
    let euler_brace = PI * PI * E * 150e-8 / 52.0 / -axial_force(&f, c, brace);
    let euler_lean = PI * PI * E * 300e-8 / 16.0 / -axial_force(&f, c, lean);
    let b = buckling(&f, c, 4);
    show("three bays", &b);
    assert_eq!(b.search, SwaySearch::Complete);
    let member = b.member.as_ref().expect("a member mode");
    verify::source("Timoshenko & Gere §2.1 (from memory): Euler loads over first-order forces");
    verify::same(
        "member of the lowest member mode (the brace)",
        brace,
        member.member,
    );
    verify::check(
        "buckling_modes/three-bays/brace",
        "α_cr of the pin-ended brace's member mode in a three-bay frame, π²EI/(L²·N)",
        "-",
        "Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., §2.1 (from memory)",
        euler_brace,
        member.alpha_cr,
        1e-3,
    );
    // The leaning column's own mode is the second.
    verify::same(
        "owner of the second mode (the leaning column)",
        ModeKind::Member { member: lean },
        b.modes[1].kind,
    );
    verify::check(
        "buckling_modes/three-bays/leaning-column",
        "α_cr of the leaning column's member mode in a three-bay frame, π²EI/(L²·N)",
        "-",
        "Timoshenko & Gere, Theory of Elastic Stability, 2nd ed., §2.1 (from memory)",
        euler_lean,
        b.modes[1].alpha_cr,
        1e-3,
    );
    let fine = sway(&buckling(&f, c, 16));
    let alpha = sway(&b);
    verify::source("the 16-element mesh (mesh error like h⁴, module documentation)");
    verify::between(
        "sway factor at 4 elements against 16",
        "-",
        alpha,
        fine,
        -2e-3,
        1e-3,
    );
    verify::source(
        "common practice, no source: the braced frame's sway mode lies far above the brace's bow",
    );
    verify::between(
        "sway-mode factor, above 40 × the brace's",
        "-",
        alpha,
        40.0 * member.alpha_cr,
        0.0,
        f64::INFINITY,
    );
}

#[test]
fn chord_rotation_and_bow_classify_the_modes_of_known_frames() {
    // The measures behind SWAY_RATIO (module documentation; common practice, no source).
    // A pinned-base portal sways in single curvature: sway, ρ/β well above 1.
    let (mut f, [_, n1, n2, _, _, _, _]) = portal(4.0, 4.0, 1e-4, 1e-4, false);
    let c = f.case("P", ActionCategory::Dead);
    f.nodal(c, n1, 0.0, -1000.0, 0.0);
    f.nodal(c, n2, 0.0, -1000.0, 0.0);
    let b = buckling(&f, c, 4);
    show("pinned-base portal", &b);
    assert_eq!(b.modes.len(), 1);
    verify::source("module documentation of SWAY_RATIO (common practice, no source)");
    verify::between(
        "pinned-base portal, sway mode: chord rotation / bow, above 3",
        "-",
        ratio(&b.modes[0]),
        3.0,
        0.0,
        f64::INFINITY,
    );

    // A braced frame with rigid joints and heavily loaded columns: the columns buckle with
    // the level held by a stiff brace and the joints rotating (non-sway modes), far below
    // the sway mode (the brace stretching).
    let mut f = Frame::new();
    let n0 = f.node(0.0, 0.0);
    let n1 = f.node(0.0, 4.0);
    let n2 = f.node(6.0, 4.0);
    let n3 = f.node(6.0, 0.0);
    let left = f.member(n0, n1, E, RIGID_A, 1e-4);
    f.member(n1, n2, E, RIGID_A, 2e-4);
    let right = f.member(n3, n2, E, RIGID_A, 1e-4);
    let brace = f.member(n0, n2, E, 50e-4, 1e-4);
    f.release(brace, true, true);
    f.pinned(n0);
    f.pinned(n3);
    let c = f.case("D", ActionCategory::Dead);
    f.nodal(c, n1, 0.0, -1000e3, 0.0);
    f.nodal(c, n2, 0.0, -1000e3, 0.0);
    let b = buckling(&f, c, 4);
    show("braced frame, rigid joints", &b);
    assert_eq!(b.search, SwaySearch::Complete);
    let (sways, members): (Vec<_>, Vec<_>) = b.modes.iter().partition(|m| m.kind == ModeKind::Sway);
    assert_eq!(sways.len(), 1);
    verify::between(
        "braced frame, sway mode: chord rotation / bow, above 3",
        "-",
        ratio(sways[0]),
        3.0,
        0.0,
        f64::INFINITY,
    );
    assert!(members.len() >= 2);
    for (k, m) in members.iter().enumerate() {
        verify::between(
            &format!(
                "braced frame, member mode {}: chord rotation / bow, below 0.9",
                k + 1
            ),
            "-",
            ratio(m),
            0.9,
            f64::NEG_INFINITY,
            0.0,
        );
    }
    let mut first = [members[0].kind, members[1].kind];
    first.sort_by_key(|k| format!("{k:?}"));
    let mut columns = [
        ModeKind::Member { member: left },
        ModeKind::Member { member: right },
    ];
    columns.sort_by_key(|k| format!("{k:?}"));
    verify::same(
        "braced frame: owners of the two lowest modes (the columns)",
        columns,
        first,
    );
}

#[test]
fn a_frame_with_nothing_in_compression_has_no_buckling() {
    // A hanger in tension only (closed form: N = +P everywhere, no geometric softening).
    let mut f = Frame::new();
    let n0 = f.node(0.0, 0.0);
    let n1 = f.node(0.0, -3.0);
    f.member(n0, n1, E, 1e-3, 1e-6);
    f.fixed(n0);
    let c = f.case("P", ActionCategory::Dead);
    f.nodal(c, n1, 0.0, -1000.0, 0.0);
    let (so, loads) = setup(&f, c, 4);
    verify::source("closed form: N = +P everywhere in a hanger, no geometric softening");
    verify::same(
        "a hanger in tension: buckling modes found",
        false,
        so.buckling(&f.model, &loads).unwrap().is_some(),
    );
}

#[test]
fn past_the_most_modes_the_sway_factor_is_a_counted_lower_bound() {
    // Thirteen pin-ended posts (I = 400 cm⁴, 4 m) with loads from 90 to 102 kN, tied to a
    // stiff portal: each post's first five bows (n² times its Euler load, Timoshenko & Gere
    // §2.1, from memory: 4.8 to 143 for the lightest) lie below the frame's sway mode, far
    // more than MAX_MODES. The search stops there; the Sturm count proves every mode below
    // the last one found is a member mode, so that factor is a lower bound of the sway
    // factor, itself below the frame's sway (estimated here by the story formula
    // π²·Σ(EI/h²)/ΣP for fixed-base columns under a rigid beam, K = 1, common practice, no
    // source).
    let (ic, p_col, h) = (1e-3, 200e3, 4.0);
    let mut f = Frame::new();
    let n0 = f.node(0.0, 0.0);
    let n1 = f.node(0.0, h);
    let n2 = f.node(8.0, h);
    let n3 = f.node(8.0, 0.0);
    f.member(n0, n1, E, RIGID_A, ic);
    f.member(n1, n2, E, RIGID_A, 1e4 * ic);
    f.member(n3, n2, E, RIGID_A, ic);
    f.fixed(n0);
    f.fixed(n3);
    let c = f.case("D", ActionCategory::Dead);
    f.nodal(c, n1, 0.0, -p_col, 0.0);
    f.nodal(c, n2, 0.0, -p_col, 0.0);
    let mut total = 2.0 * p_col;
    let mut lightest = f64::INFINITY;
    let mut previous = n2;
    for k in 0..13 {
        let x = 8.0 + 2.0 * (k + 1) as f64;
        let base = f.node(x, 0.0);
        let top = f.node(x, h);
        f.member(base, top, E, RIGID_A, 400e-8);
        let link = f.member(previous, top, E, RIGID_A, 1e-4);
        f.release(link, true, true);
        f.pinned(base);
        let p = (90.0 + k as f64) * 1e3;
        f.nodal(c, top, 0.0, -p, 0.0);
        total += p;
        lightest = lightest.min(p);
        previous = top;
    }
    let b = buckling(&f, c, 4);
    eprintln!(
        "{:?}: {} modes, last {:?}, sway {:?}",
        b.search,
        b.modes.len(),
        b.modes.last().map(|m| m.alpha_cr),
        b.sway.as_ref().map(|s| s.alpha_cr)
    );
    assert_eq!(b.search, SwaySearch::LowerBound);
    assert!(b.modes.len() >= plumbline::solve::modes::MAX_MODES);
    assert!(b.modes.iter().all(|m| m.kind != ModeKind::Sway));
    let bound = sway(&b);
    assert_eq!(bound, b.modes.last().unwrap().alpha_cr);
    let story = PI * PI * 2.0 * E * ic / (h * h) / total;
    let euler = PI * PI * E * 400e-8 / (h * h) / lightest;
    assert!(bound < story, "{bound} vs {story}");
    verify::source(
        "story formula π²·Σ(EI/h²)/ΣP, K = 1 (common practice, no source): the sway factor lies above the bound",
    );
    verify::between(
        "lower bound against the story formula",
        "-",
        bound,
        story,
        f64::NEG_INFINITY,
        0.0,
    );
    verify::source(
        "Timoshenko & Gere §2.1 (from memory): the lightest post's second bow, 4·π²EI/(L²·N)",
    );
    verify::between(
        "lower bound against the lightest post's second bow",
        "-",
        bound,
        4.0 * euler,
        0.0,
        f64::INFINITY,
    );
    assert!(bound > 4.0 * euler, "{bound} vs {euler}");
}

#[test]
fn random_frames_give_complete_consistent_buckling() {
    // Properties, no engineering number (common practice, no source): on seeded random
    // frames (`tests/common/random_frame.rs`, beam releases included) the search is
    // complete; the lowest mode is `critical_factor`'s; a lowest sway mode is reported at
    // most at its mesh factor (the safe side only lowers it); a member mode is reported
    // below the sway mode.
    use common::random_frame::RandomFrame;
    for seed in 0..24 {
        let rf = RandomFrame::new(seed);
        let st = member_stiffness(&rf.model);
        let so = SecondOrderModel::new(&rf.model, &st, rf.model.analysis.segments).unwrap();
        for fc in &rf.cases {
            let mut loads = MeshLoads::zero(&so.mesh);
            for &(k, f) in &fc.factors {
                loads.add_case(&rf.model, &so.mesh, k, f);
            }
            let raw = so.critical_factor(&rf.model, &loads).unwrap();
            let Some(b) = so.buckling(&rf.model, &loads).unwrap() else {
                assert!(raw.is_none(), "seed {seed}");
                continue;
            };
            assert_eq!(b.search, SwaySearch::Complete, "seed {seed} {}", fc.id);
            let (Some(raw), Some(first)) = (raw, b.modes.first()) else {
                continue;
            };
            let tol = 1e-6 * raw.alpha_cr;
            verify::observe((first.alpha_mesh - raw.alpha_cr).abs() / raw.alpha_cr);
            assert!(
                (first.alpha_mesh - raw.alpha_cr).abs() <= tol,
                "seed {seed}"
            );
            if first.kind == ModeKind::Sway {
                assert!(sway(&b) <= raw.alpha_cr + tol, "seed {seed}");
                assert!(b.member.is_none());
            }
            if let (Some(m), Some(s)) = (&b.member, &b.sway) {
                assert!(m.alpha_cr <= s.alpha_cr, "seed {seed}");
            }
        }
    }
    verify::property(
        "buckling_modes/random_frames_give_complete_consistent_buckling",
        "the search for the lowest sway mode is complete; the lowest mode is the critical \
         factor's; a sway mode is reported at most at its mesh factor; a member mode lies \
         below the sway mode (common practice, no source)",
        24,
        "largest |lowest mode − critical factor| / critical factor",
        verify::observed(),
        "1e-6",
    );
}
