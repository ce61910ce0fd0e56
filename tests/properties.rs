//! Properties of the analysis over seeded random frames (issue 13 item 4), on the generator
//! `common::random_frame` (1–4 unequal bays, 1–6 unequal stories, fixed and pinned bases,
//! beam end releases, gravity-only and lateral cases; invented frames, so no number here is
//! an expected value: each property compares plumbline with itself under a transformation
//! whose effect is known in closed form).
//!
//! * equilibrium at every node, summed independently of the solver's own residual
//!   (statics: ΣF = 0, ΣM = 0 at each free body);
//! * superposition: the solution of a factored load equals the factored sum of the load
//!   cases' solutions, and no-sway + sway = the free frame's solution (linear elasticity,
//!   closed form);
//! * mirror symmetry: the frame reflected in a vertical line under reflected loads gives
//!   reflected results (closed form: ux, rz, Fy, Mz change sign; uy, Fx do not);
//! * invariance under a rigid translation of the coordinates and under a change of the
//!   model file's units (closed form: the SI results are the same);
//! * the no-sway part is unchanged by lateral loads that the holding system takes entirely
//!   (loads shared equally by a level's nodes, the shape of the holding force): closed form
//!   from the definition of the split in `solve/sway.rs`.
//!
//! The design-diagram extremes against dense sampling are asserted in
//! `tests/random_frames.rs` with the member figures.

mod common;

use common::random_frame::RandomFrame;
use common::verify;
use plumbline::check::check;
use plumbline::model::{LoadDirection, MemberLoadKind, Model, Restraint};
use plumbline::solve::linear::MeshLoads;
use plumbline::solve::sway::SwaySplit;
use plumbline::solve::{FirstOrder, Solution};

/// Frames per property (the brief asks for moderate counts; issue 7 uses 100).
const FRAMES: u64 = 100;

/// Relative tolerance of results that should agree exactly but for round-off: a few
/// hundred ε times the condition of these small frames (common practice, no source).
const TOL: f64 = 1e-9;

/// Largest magnitude in a solution, to scale tolerances.
fn scale(s: &Solution) -> (f64, f64) {
    let u = s
        .displacements
        .iter()
        .flatten()
        .fold(0.0_f64, |m, v| m.max(v.abs()));
    let f = s
        .end_forces
        .iter()
        .flat_map(|e| e.to_array())
        .chain(s.reactions.iter().flatten().copied())
        .fold(0.0_f64, |m, v| m.max(v.abs()));
    (u.max(1e-30), f.max(1e-30))
}

/// Assert that two solutions agree, with `map` applied to `b` first (identity, mirror…).
fn assert_same(a: &Solution, b: &Solution, what: &str) {
    let (us, fs) = scale(a);
    for (n, (x, y)) in a.displacements.iter().zip(&b.displacements).enumerate() {
        for k in 0..3 {
            verify::observe((x[k] - y[k]).abs() / us);
            assert!(
                (x[k] - y[k]).abs() <= TOL * us,
                "{what}: node {n} displacement {k}: {} vs {}",
                x[k],
                y[k]
            );
        }
    }
    for (n, (x, y)) in a.reactions.iter().zip(&b.reactions).enumerate() {
        for k in 0..3 {
            verify::observe((x[k] - y[k]).abs() / fs);
            assert!(
                (x[k] - y[k]).abs() <= TOL * fs,
                "{what}: node {n} reaction {k}: {} vs {}",
                x[k],
                y[k]
            );
        }
    }
    for (m, (x, y)) in a.end_forces.iter().zip(&b.end_forces).enumerate() {
        let (x, y) = (x.to_array(), y.to_array());
        for k in 0..6 {
            verify::observe((x[k] - y[k]).abs() / fs);
            assert!(
                (x[k] - y[k]).abs() <= TOL * fs,
                "{what}: member {m} end force {k}: {} vs {}",
                x[k],
                y[k]
            );
        }
    }
}

/// The free frame's solution of `Σ f·case`.
fn solve_factored(fo: &FirstOrder, model: &Model, factors: &[(usize, f64)]) -> Solution {
    let mut loads = MeshLoads::zero(&fo.mesh);
    for &(c, f) in factors {
        loads.add_case(model, &fo.mesh, c, f);
    }
    fo.solve_loads(model, &loads)
        .expect("random frames are stable")
}

/// Statics at node `n`: applied nodal loads + reaction − Σ member-end actions turned to
/// global axes (the members push back on the node) = 0.
fn node_out_of_balance(model: &Model, case: usize, s: &Solution, n: usize) -> [f64; 3] {
    let mut r = s.reactions[n];
    for l in model.load_cases[case].nodal.iter().filter(|l| l.node == n) {
        r[0] += l.fx;
        r[1] += l.fy;
        r[2] += l.mz;
    }
    for (m, member) in model.members.iter().enumerate() {
        let end = if member.i == n {
            s.end_forces[m].i
        } else if member.j == n {
            s.end_forces[m].j
        } else {
            continue;
        };
        let (c, si) = model.cosines(m);
        // Local → global: X = c·Fx − s·Fy, Y = s·Fx + c·Fy.
        r[0] -= c * end[0] - si * end[1];
        r[1] -= si * end[0] + c * end[1];
        r[2] -= end[2];
    }
    r
}

#[test]
fn equilibrium_at_every_node() {
    for seed in 0..FRAMES {
        let rf = RandomFrame::new(seed);
        let model = &rf.model;
        let fo = FirstOrder::new(model, &[]).unwrap();
        for case in 0..model.load_cases.len() {
            let s = fo.solve_case(model, case).unwrap();
            let (_, fs) = scale(&s);
            for n in 0..model.nodes.len() {
                let r = node_out_of_balance(model, case, &s, n);
                for (k, v) in r.iter().enumerate() {
                    verify::observe(v.abs() / fs);
                    assert!(
                        v.abs() <= TOL * fs,
                        "frame {seed}, case {case}, node {n}, component {k}: out of balance {v} N"
                    );
                }
            }
        }
    }
    verify::property(
        "properties/equilibrium_at_every_node",
        "statics at every node of every load case: applied loads + reactions − member end actions = 0",
        (FRAMES) as usize,
        "largest out-of-balance / the solution's largest force",
        verify::observed(),
        "1e-9 (TOL)",
    );
}

#[test]
fn a_factored_solution_is_the_factored_sum_of_the_load_cases() {
    for seed in 0..FRAMES {
        let rf = RandomFrame::new(seed);
        let model = &rf.model;
        let stories = plumbline::stories::stories(model).unwrap();
        let split = SwaySplit::new(model, &stories).unwrap();
        let fo = &split.free;
        let per_case: Vec<Solution> = (0..model.load_cases.len())
            .map(|c| fo.solve_case(model, c).unwrap())
            .collect();
        for fc in &rf.cases {
            let direct = solve_factored(fo, model, &fc.factors);
            let parts: Vec<(f64, &Solution)> =
                fc.factors.iter().map(|&(c, f)| (f, &per_case[c])).collect();
            let summed = Solution::combine(&parts);
            assert_same(&direct, &summed, &format!("frame {seed}, {}", fc.id));
            // No-sway + sway parts of the factored load = the free frame's solution.
            let mut loads = split.zero_loads();
            for &(c, f) in &fc.factors {
                loads.add_case(model, &fo.mesh, c, f);
            }
            let p = split.split(model, &loads).unwrap();
            assert_same(
                &direct,
                &p.total(),
                &format!("frame {seed}, {} split", fc.id),
            );
        }
    }
    verify::property(
        "properties/a_factored_solution_is_the_factored_sum_of_the_load_cases",
        "a factored case solved directly equals the factor-weighted sum of its load cases, and its no-sway + sway parts equal the free frame",
        (FRAMES) as usize,
        "largest difference / the solution's largest displacement or force",
        verify::observed(),
        "1e-9 (TOL)",
    );
}

/// The model reflected in the line x = 0, with its loads reflected: nodal fx and mz and
/// global-X member loads change sign; downward and global-Y loads keep theirs; local-y
/// loads and concentrated moments change sign (a reflection turns local y to −y).
fn mirrored(model: &Model) -> Model {
    let mut m = model.clone();
    for n in &mut m.nodes {
        n.x = -n.x;
    }
    for case in &mut m.load_cases {
        for l in &mut case.nodal {
            l.fx = -l.fx;
            l.mz = -l.mz;
        }
        for l in &mut case.member {
            let flips =
                |d: &LoadDirection| matches!(d, LoadDirection::GlobalX | LoadDirection::LocalY);
            match &mut l.kind {
                MemberLoadKind::Distributed {
                    w_a,
                    w_b,
                    direction,
                    ..
                } if flips(direction) => {
                    *w_a = -*w_a;
                    *w_b = -*w_b;
                }
                MemberLoadKind::Point { p, direction, .. } if flips(direction) => *p = -*p,
                MemberLoadKind::Moment { m, .. } => *m = -*m,
                _ => {}
            }
        }
    }
    m
}

/// A solution seen in the mirror: ux, rz, reactions Rx and Mz, and member-end Fy and Mz
/// change sign (local y turns to −y); uy, Ry and Fx do not.
fn reflect(s: &Solution) -> Solution {
    let mut r = s.clone();
    for d in r.displacements.iter_mut().chain(r.reactions.iter_mut()) {
        d[0] = -d[0];
        d[2] = -d[2];
    }
    for e in &mut r.end_forces {
        for end in [&mut e.i, &mut e.j] {
            end[1] = -end[1];
            end[2] = -end[2];
        }
    }
    r
}

#[test]
fn a_mirrored_frame_gives_mirrored_results() {
    for seed in 0..FRAMES {
        let rf = RandomFrame::new(seed);
        let (a, b) = (&rf.model, &mirrored(&rf.model));
        let (fa, fb) = (
            FirstOrder::new(a, &[]).unwrap(),
            FirstOrder::new(b, &[]).unwrap(),
        );
        for case in 0..a.load_cases.len() {
            let sa = fa.solve_case(a, case).unwrap();
            let sb = fb.solve_case(b, case).unwrap();
            assert_same(
                &sa,
                &reflect(&sb),
                &format!("frame {seed}, case {case} mirrored"),
            );
        }
    }
    verify::property(
        "properties/a_mirrored_frame_gives_mirrored_results",
        "the frame reflected in x = 0 with its loads gives the reflected results",
        (FRAMES) as usize,
        "largest difference / the solution's largest displacement or force",
        verify::observed(),
        "1e-9 (TOL)",
    );
}

#[test]
fn a_rigid_translation_changes_no_result() {
    for seed in 0..FRAMES {
        let rf = RandomFrame::new(seed);
        let mut moved = rf.model.clone();
        for n in &mut moved.nodes {
            n.x += 1234.5;
            n.y -= 67.8;
        }
        let (fa, fb) = (
            FirstOrder::new(&rf.model, &[]).unwrap(),
            FirstOrder::new(&moved, &[]).unwrap(),
        );
        for case in 0..rf.model.load_cases.len() {
            let sa = fa.solve_case(&rf.model, case).unwrap();
            let sb = fb.solve_case(&moved, case).unwrap();
            assert_same(&sa, &sb, &format!("frame {seed}, case {case} translated"));
        }
        // The whole check too: stories, amplifiers and design moments.
        if seed % 4 == 0 {
            let (ca, cb) = (
                check(&rf.model, &rf.cases).unwrap(),
                check(&moved, &rf.cases).unwrap(),
            );
            for (x, y) in ca.cases.iter().zip(&cb.cases) {
                assert_eq!(x.stable, y.stable, "frame {seed}, {}", x.id);
                for (mx, my) in x.members.iter().zip(&y.members) {
                    for (ex, ey) in mx.ends.iter().zip(&my.ends) {
                        // An unstable member has no design value (NaN) in either frame.
                        let tol = 1e-7 * ex.design.abs().max(1.0);
                        let same = (ex.design - ey.design).abs() <= tol
                            || (ex.design.is_nan() && ey.design.is_nan());
                        assert!(
                            same,
                            "frame {seed}, {}, member {}: design moment {} vs {} translated",
                            x.id, mx.member, ex.design, ey.design
                        );
                    }
                }
            }
        }
    }
    verify::property(
        "properties/a_rigid_translation_changes_no_result",
        "moving every node by the same vector changes no result (first order; the whole check on every fourth frame)",
        (FRAMES) as usize,
        "largest difference / the solution's largest displacement or force",
        verify::observed(),
        "1e-9 (TOL)",
    );
}

/// Exact unit definitions for the change-of-units property (NIST SP 811, Appendix B:
/// 1 ft = 0.3048 m, 1 in = 0.0254 m, 1 lbf = 4.4482216152605 N).
mod si {
    pub const FT: f64 = 0.3048;
    pub const IN: f64 = 0.0254;
    pub const KIP: f64 = 4_448.221_615_260_5;
}

/// Unit factors (SI per unit) of the two presets written: length, force, section, stress.
struct Preset {
    name: &'static str,
    length: f64,
    force: f64,
    section: f64,
    stress: f64,
}

const KN_M: Preset = Preset {
    name: "kN-m",
    length: 1.0,
    force: 1e3,
    section: 1e-3,
    stress: 1e6,
};

const KIP_FT: Preset = Preset {
    name: "kip-ft",
    length: si::FT,
    force: si::KIP,
    section: si::IN,
    stress: si::KIP / (si::IN * si::IN),
};

/// The model as a model file in preset `u`, every value a bare number in its units.
fn model_file(model: &Model, u: &Preset) -> String {
    // Gross stiffness, as the Rust-built frame has (a file without it gets the method's).
    let mut t = format!(
        "title = \"random frame\"\nunits = \"{}\"\n\n[analysis]\nstiffness = \"gross\"\n",
        u.name
    );
    for (k, mat) in model.materials.iter().enumerate() {
        t += &format!(
            "\n[[material]]\nid = \"E{k}\"\nE = {:e}\n",
            mat.e / u.stress
        );
    }
    for (k, s) in model.sections.iter().enumerate() {
        t += &format!(
            "\n[[section]]\nid = \"S{k}\"\nA = {:e}\nI = {:e}\n",
            s.area / u.section.powi(2),
            s.inertia / u.section.powi(4)
        );
    }
    for n in &model.nodes {
        t += &format!(
            "\n[[node]]\nid = \"{}\"\nx = {:e}\ny = {:e}\n",
            n.id,
            n.x / u.length,
            n.y / u.length
        );
    }
    for m in &model.members {
        let hinge = match (m.release_i, m.release_j) {
            (false, false) => "none",
            (true, false) => "i",
            (false, true) => "j",
            (true, true) => "both",
        };
        t += &format!(
            "\n[[member]]\nid = \"{}\"\ni = \"{}\"\nj = \"{}\"\nsection = \"S{}\"\nmaterial = \"E{}\"\nhinge = \"{hinge}\"\n",
            m.id, model.nodes[m.i].id, model.nodes[m.j].id, m.section, m.material
        );
    }
    for s in &model.supports {
        let kind = match s.dofs[2] {
            Restraint::Fixed => "fixed",
            _ => "pinned",
        };
        t += &format!(
            "\n[[support]]\nnode = \"{}\"\ntype = \"{kind}\"\n",
            model.nodes[s.node].id
        );
        if let Restraint::Spring(k) = s.dofs[2] {
            t += &format!("kr = {:e}\n", k / (u.force * u.length));
        }
    }
    for c in &model.load_cases {
        t += &format!(
            "\n[[case]]\nid = \"{}\"\ncategory = \"{}\"\n",
            c.id, c.category
        );
        for l in &c.nodal {
            t += &format!(
                "\n[[case.node_load]]\nnodes = \"{}\"\nfx = {:e}\nfy = {:e}\nmz = {:e}\n",
                model.nodes[l.node].id,
                l.fx / u.force,
                l.fy / u.force,
                l.mz / (u.force * u.length)
            );
        }
        for l in &c.member {
            let member = &model.members[l.member].id;
            t += &match &l.kind {
                MemberLoadKind::Distributed { w_a, .. } => format!(
                    "\n[[case.member_load]]\nmembers = \"{member}\"\nkind = \"uniform\"\ndirection = \"down\"\nw = {:e}\n",
                    w_a / (u.force / u.length)
                ),
                MemberLoadKind::Point { a, p, .. } => format!(
                    "\n[[case.member_load]]\nmembers = \"{member}\"\nkind = \"point\"\ndirection = \"down\"\np = {:e}\nat = {:e}\n",
                    p / u.force,
                    a / u.length
                ),
                MemberLoadKind::Moment { .. } => unreachable!("random frames carry no moments"),
            };
        }
    }
    t
}

#[test]
fn the_model_files_units_change_no_result() {
    for seed in 0..FRAMES / 2 {
        let rf = RandomFrame::new(seed);
        // The generator's loads are full-length downward uniform loads and downward point
        // loads, which the file writer above spells out.
        let read = |u: &Preset| {
            plumbline::input::parse_model(&model_file(&rf.model, u), "random.toml")
                .unwrap_or_else(|e| panic!("frame {seed} in {}: {e}", u.name))
        };
        let (a, b) = (read(&KN_M), read(&KIP_FT));
        let (fa, fb) = (
            FirstOrder::new(&a, &[]).unwrap(),
            FirstOrder::new(&b, &[]).unwrap(),
        );
        for case in 0..a.load_cases.len() {
            let sa = fa.solve_case(&a, case).unwrap();
            let sb = fb.solve_case(&b, case).unwrap();
            assert_same(
                &sa,
                &sb,
                &format!("frame {seed}, case {case}, kN-m vs kip-ft"),
            );
            // And both equal the frame built in SI directly.
            let s0 = FirstOrder::new(&rf.model, &[])
                .unwrap()
                .solve_case(&rf.model, case)
                .unwrap();
            assert_same(&s0, &sa, &format!("frame {seed}, case {case}, SI vs kN-m"));
        }
    }
    verify::property(
        "properties/the_model_files_units_change_no_result",
        "the frame written as a model file in kN-m and in kip-ft and read back gives the SI results",
        (FRAMES / 2) as usize,
        "largest difference / the solution's largest displacement or force",
        verify::observed(),
        "1e-9 (TOL)",
    );
}

#[test]
fn lateral_loads_the_holds_take_leave_the_no_sway_part_unchanged() {
    for seed in 0..FRAMES {
        let rf = RandomFrame::new(seed);
        let model = &rf.model;
        let stories = plumbline::stories::stories(model).unwrap();
        let split = SwaySplit::new(model, &stories).unwrap();
        let mesh = &split.free.mesh;
        for fc in &rf.cases {
            let mut loads = split.zero_loads();
            for &(c, f) in &fc.factors {
                loads.add_case(model, mesh, c, f);
            }
            let base = split.split(model, &loads).unwrap();
            // H_l at each held level, shared equally by the level's nodes: the shape of the
            // holding force, so the holds take it all.
            let h: Vec<f64> = (0..stories.len())
                .map(|l| 10e3 * (l as f64 + 1.5))
                .collect();
            let mut pushed = loads.clone();
            for (nodes, &hl) in split.level_nodes.iter().zip(&h) {
                for &n in nodes {
                    pushed.add_nodal(n, [hl / nodes.len() as f64, 0.0, 0.0]);
                }
            }
            let with = split.split(model, &pushed).unwrap();
            let what = format!("frame {seed}, {}", fc.id);
            let (us, fs) = scale(&with.total());
            let close = |x: &Solution, y: &Solution, tag: &str| {
                for (a, b) in x.displacements.iter().zip(&y.displacements) {
                    for k in 0..3 {
                        verify::observe((a[k] - b[k]).abs() / us);
                        assert!((a[k] - b[k]).abs() <= TOL * us, "{what}: {tag}");
                    }
                }
                for (a, b) in x.end_forces.iter().zip(&y.end_forces) {
                    for (p, q) in a.to_array().iter().zip(b.to_array()) {
                        verify::observe((p - q).abs() / fs);
                        assert!((p - q).abs() <= TOL * fs, "{what}: {tag}");
                    }
                }
            };
            close(&base.no_sway, &with.no_sway, "no-sway part changed");
            // The sway part takes the lateral load whole.
            let h_held: Vec<f64> = split
                .level_nodes
                .iter()
                .zip(&h)
                .map(|(nodes, &hl)| if nodes.is_empty() { 0.0 } else { hl })
                .collect();
            let mut expected = base.sway.clone();
            expected.add_scaled(1.0, &split.lateral(&h_held));
            close(
                &expected,
                &with.sway,
                "sway part is not the old one plus the lateral load",
            );
        }
    }
    verify::property(
        "properties/lateral_loads_the_holds_take_leave_the_no_sway_part_unchanged",
        "lateral loads at the held levels leave the no-sway part unchanged and enter the sway part whole",
        (FRAMES) as usize,
        "largest difference / the solution's largest displacement or force",
        verify::observed(),
        "1e-9 (TOL)",
    );
}
