//! Builders for small frames written directly in Rust (SI units), shared by the
//! integration tests.
#![allow(dead_code)]

pub mod random_frame;
pub mod verify;

use plumbline::model::*;
use plumbline::units::{Unit, UnitSystem};

/// The shipped example model files (`examples/*.toml`), sorted, by absolute path.
pub fn examples() -> Vec<std::path::PathBuf> {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("examples");
    let mut v: Vec<std::path::PathBuf> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.extension().is_some_and(|x| x == "toml"))
        .collect();
    v.sort();
    assert!(v.len() >= 3, "issue #2 asks for at least three examples");
    v
}

/// SI units for reports of test models.
pub fn si_units() -> UnitSystem {
    let u = |name: &str, factor: f64, dim: (i32, i32)| Unit {
        name: name.into(),
        factor,
        dim,
    };
    UnitSystem {
        length: u("m", 1.0, (1, 0)),
        force: u("N", 1.0, (0, 1)),
        section: u("m", 1.0, (1, 0)),
        stress: u("Pa", 1.0, (-2, 1)),
        deflection: u("m", 1.0, (1, 0)),
    }
}

/// A frame under construction.
pub struct Frame {
    pub model: Model,
}

impl Default for Frame {
    fn default() -> Self {
        Self::new()
    }
}

impl Frame {
    pub fn new() -> Frame {
        Frame {
            model: Model {
                title: "test frame".into(),
                units: si_units(),
                nodes: vec![],
                materials: vec![],
                sections: vec![],
                members: vec![],
                supports: vec![],
                load_cases: vec![],
                combos: ComboChoice::default(),
                analysis: AnalysisOptions::default(),
                stories: None,
            },
        }
    }

    pub fn node(&mut self, x: f64, y: f64) -> usize {
        let id = format!("N{}", self.model.nodes.len() + 1);
        self.model.nodes.push(Node { id, x, y });
        self.model.nodes.len() - 1
    }

    /// A member with its own material (E) and section (A, I); role from orientation.
    pub fn member(&mut self, i: usize, j: usize, e: f64, a: f64, inertia: f64) -> usize {
        let k = self.model.members.len();
        self.model.materials.push(Material {
            id: format!("E{k}"),
            e,
            unit_weight: None,
        });
        self.model.sections.push(Section {
            id: format!("S{k}"),
            area: a,
            inertia,
            depth: None,
            role: None,
        });
        let (ni, nj) = (&self.model.nodes[i], &self.model.nodes[j]);
        let vertical = (nj.y - ni.y).abs() > (nj.x - ni.x).abs();
        self.model.members.push(Member {
            id: format!("M{}", k + 1),
            i,
            j,
            section: k,
            material: k,
            release_i: false,
            release_j: false,
            role: if vertical { Role::Column } else { Role::Beam },
        });
        k
    }

    pub fn release(&mut self, m: usize, at_i: bool, at_j: bool) {
        self.model.members[m].release_i = at_i;
        self.model.members[m].release_j = at_j;
    }

    pub fn support(&mut self, node: usize, dofs: [Restraint; 3]) {
        self.model.supports.push(Support { node, dofs });
    }

    pub fn fixed(&mut self, node: usize) {
        self.support(node, [Restraint::Fixed; 3]);
    }

    pub fn pinned(&mut self, node: usize) {
        self.support(node, [Restraint::Fixed, Restraint::Fixed, Restraint::Free]);
    }

    pub fn case(&mut self, id: &str, category: ActionCategory) -> usize {
        self.model.load_cases.push(LoadCase::new(id, category));
        self.model.load_cases.len() - 1
    }

    pub fn nodal(&mut self, case: usize, node: usize, fx: f64, fy: f64, mz: f64) {
        self.model.load_cases[case]
            .nodal
            .push(NodalLoad { node, fx, fy, mz });
    }

    /// Full-length uniform load of intensity `w` in `direction`.
    pub fn udl(&mut self, case: usize, member: usize, w: f64, direction: LoadDirection) {
        let l = self.model.length(member);
        self.member_load(
            case,
            member,
            MemberLoadKind::Distributed {
                a: 0.0,
                b: l,
                w_a: w,
                w_b: w,
                direction,
                measure: Measure::AlongMember,
            },
        );
    }

    pub fn member_load(&mut self, case: usize, member: usize, kind: MemberLoadKind) {
        self.model.load_cases[case]
            .member
            .push(MemberLoad { member, kind });
    }
}

/// A single-bay portal: span `l`, height `h`, column inertia `ic`, beam inertia `ib`,
/// bases fixed or pinned, axially almost rigid (A large) so closed forms that neglect
/// axial shortening apply. Returns the frame and (base_left, top_left, top_right,
/// base_right, col_left, beam, col_right).
pub fn portal(l: f64, h: f64, ic: f64, ib: f64, fixed: bool) -> (Frame, [usize; 7]) {
    let e = 200e9;
    let big_a = 10.0;
    let mut f = Frame::new();
    let n0 = f.node(0.0, 0.0);
    let n1 = f.node(0.0, h);
    let n2 = f.node(l, h);
    let n3 = f.node(l, 0.0);
    let c1 = f.member(n0, n1, e, big_a, ic);
    let b = f.member(n1, n2, e, big_a, ib);
    let c2 = f.member(n3, n2, e, big_a, ic);
    if fixed {
        f.fixed(n0);
        f.fixed(n3);
    } else {
        f.pinned(n0);
        f.pinned(n3);
    }
    (f, [n0, n1, n2, n3, c1, b, c2])
}

/// A factored case on the strength basis with `factors` on the model's load cases.
pub fn strength(id: &str, factors: &[(usize, f64)]) -> plumbline::combos::FactoredCase {
    random_frame::factored(id, plumbline::combos::Basis::Strength, factors)
}

/// Run `check` on one factored case and return its only result (fails if notional loads
/// split it in two).
pub fn only_case(
    model: &Model,
    fc: &plumbline::combos::FactoredCase,
) -> plumbline::check::CaseCheck {
    let report = plumbline::check::check(model, std::slice::from_ref(fc)).unwrap();
    assert_eq!(report.cases.len(), 1, "expected one case");
    report.cases.into_iter().next().unwrap()
}
