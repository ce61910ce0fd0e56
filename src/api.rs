//! The library's entry points for the main job: build or read a frame, choose a
//! combination table and a second-order method, run the check, read the envelopes.
//!
//! Everything here is SI (m, N, Pa, N·m) and is re-exported at the crate root. The items of
//! this module are the **stable** part of the library (see `docs/library.md`); the stage
//! modules behind them ([`crate::check`], [`crate::envelope`], …) may change between
//! versions.
//!
//! The crate-level documentation holds a worked example that builds a portal, checks it
//! and prints its governing moments; `examples/portal.rs` and `examples/folder.rs` are two
//! whole programs. Reading a file is one line:
//!
//! ```no_run
//! let outcome = plumbline::check_file("examples/office-3story.toml")?;
//! for g in outcome.governing() {
//!     println!("{}: {:.0} N·m ({})", g.member, g.moment, g.case);
//! }
//! println!("{}", outcome.caution());
//! # Ok::<(), plumbline::Error>(())
//! ```

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use crate::check::{CheckError, CheckReport};
use crate::combos::{Basis, ComboTable, FactoredCase, Settings, expand_with, load_table};
use crate::diag::FileError;
use crate::envelope::{Envelope, GoverningMoment, MemberEnvelope, StoryEnvelope};
use crate::model::{
    ActionCategory, AnalysisOptions, ComboChoice, LoadCase, LoadDirection, LoadLevel, Material,
    Measure, Member, MemberLoad, MemberLoadKind, Model, NodalLoad, Node, Restraint,
    SecondOrderMethod, Section, Support,
};
use crate::units::UnitSystem;

/// An error of the library's entry points.
#[derive(Debug, thiserror::Error, miette::Diagnostic)]
pub enum Error {
    /// An error located in a model file or a combination table (file, line, field).
    #[error(transparent)]
    #[diagnostic(transparent)]
    File(Box<FileError>),
    /// A frame built in code is inconsistent: an unknown or repeated id, a value that is
    /// not a positive finite number, a member of zero length.
    #[error("frame {frame}: {message}")]
    Build { frame: String, message: String },
    /// The check cannot run as asked: no table, no load cases, a serviceability table.
    #[error("{0}")]
    Request(String),
    /// The frame could not be analysed (a mechanism, an irregular story, …).
    #[error("{model}: {source}")]
    Analysis {
        model: String,
        #[source]
        source: CheckError,
    },
}

impl From<FileError> for Error {
    fn from(e: FileError) -> Self {
        Error::File(Box::new(e))
    }
}

/// Read and validate a model file (TOML; `docs/model-file.md`). Every quantity of the
/// returned [`Model`] is in SI; the file's units are kept only for reports.
pub fn read_model(path: impl AsRef<Path>) -> Result<Model, Error> {
    Ok(crate::input::load_model(path.as_ref())?)
}

/// A planar frame written in code, in SI: nodes (m), materials (E in Pa), sections (A in
/// m², I in m⁴), members, supports, load cases and their loads (N, N/m, N·m).
///
/// Entities are named by id; [`FrameBuilder::build`] resolves the ids and checks the values,
/// and reports the first problem as [`Error::Build`]. Loads follow the sign convention of
/// [`crate::model::loads`]: global X to the right, Y up, moments counter-clockwise.
/// A member's role (column, beam) follows from its orientation, as in a model file.
#[derive(Debug, Clone)]
pub struct FrameBuilder {
    title: String,
    nodes: Vec<Node>,
    materials: Vec<Material>,
    sections: Vec<Section>,
    /// (id, end i, end j, material, section, release i, release j)
    members: Vec<MemberSpec>,
    supports: Vec<(String, [Restraint; 3])>,
    cases: Vec<LoadCase>,
    nodal: Vec<(String, String, [f64; 3])>,
    lines: Vec<(String, String, f64)>,
    table: Option<String>,
    problems: Vec<String>,
}

#[derive(Debug, Clone)]
struct MemberSpec {
    id: String,
    ends: [String; 2],
    material: String,
    section: String,
    releases: [bool; 2],
}

impl FrameBuilder {
    /// An empty frame with a title (printed at the head of reports).
    pub fn new(title: &str) -> FrameBuilder {
        FrameBuilder {
            title: title.to_string(),
            nodes: Vec::new(),
            materials: Vec::new(),
            sections: Vec::new(),
            members: Vec::new(),
            supports: Vec::new(),
            cases: Vec::new(),
            nodal: Vec::new(),
            lines: Vec::new(),
            table: None,
            problems: Vec::new(),
        }
    }

    /// A node at (x, y), m.
    pub fn node(&mut self, id: &str, x: f64, y: f64) -> &mut Self {
        if !(x.is_finite() && y.is_finite()) {
            self.problem(format!("node {id}: coordinates must be finite"));
        }
        self.nodes.push(Node {
            id: id.to_string(),
            x,
            y,
        });
        self
    }

    /// An elastic material with Young's modulus `e`, Pa.
    pub fn material(&mut self, id: &str, e: f64) -> &mut Self {
        self.positive(&format!("material {id}: E"), e);
        self.materials.push(Material {
            id: id.to_string(),
            e,
            unit_weight: None,
        });
        self
    }

    /// A section with area `area` (m²) and second moment of area `inertia` (m⁴).
    pub fn section(&mut self, id: &str, area: f64, inertia: f64) -> &mut Self {
        self.positive(&format!("section {id}: A"), area);
        self.positive(&format!("section {id}: I"), inertia);
        self.sections.push(Section {
            id: id.to_string(),
            area,
            inertia,
            depth: None,
            role: None,
        });
        self
    }

    /// A prismatic member from node `i` to node `j`, rigidly connected at both ends.
    pub fn member(
        &mut self,
        id: &str,
        i: &str,
        j: &str,
        material: &str,
        section: &str,
    ) -> &mut Self {
        self.members.push(MemberSpec {
            id: id.to_string(),
            ends: [i.to_string(), j.to_string()],
            material: material.to_string(),
            section: section.to_string(),
            releases: [false, false],
        });
        self
    }

    /// Release the moment (a hinge) at end i and/or end j of member `id`, declared before.
    pub fn release(&mut self, id: &str, at_i: bool, at_j: bool) -> &mut Self {
        match self.members.iter_mut().find(|m| m.id == id) {
            Some(m) => m.releases = [at_i, at_j],
            None => self.problem(format!("release: no member {id} declared before")),
        }
        self
    }

    /// A support at `node` with the restraints of (X, Y, rotation).
    pub fn support(&mut self, node: &str, dofs: [Restraint; 3]) -> &mut Self {
        self.supports.push((node.to_string(), dofs));
        self
    }

    /// A fixed base at `node`.
    pub fn fixed(&mut self, node: &str) -> &mut Self {
        self.support(node, [Restraint::Fixed; 3])
    }

    /// A pinned base at `node` (X and Y held, rotation free).
    pub fn pinned(&mut self, node: &str) -> &mut Self {
        self.support(node, [Restraint::Fixed, Restraint::Fixed, Restraint::Free])
    }

    /// A service-level load case of `category`.
    pub fn case(&mut self, id: &str, category: ActionCategory) -> &mut Self {
        self.cases.push(LoadCase::new(id, category));
        self
    }

    /// The level at which case `id`'s magnitudes were computed (wind, snow, seismic).
    pub fn level(&mut self, id: &str, level: LoadLevel) -> &mut Self {
        self.with_case(id, |c| c.level = Some(level))
    }

    /// Case `id` also acts reversed (a lateral load from the other side).
    pub fn reversible(&mut self, id: &str) -> &mut Self {
        self.with_case(id, |c| c.reverse = true)
    }

    /// A force (`fx`, `fy`, N, global axes) at `node` in load case `case`.
    pub fn node_load(&mut self, case: &str, node: &str, fx: f64, fy: f64) -> &mut Self {
        if !(fx.is_finite() && fy.is_finite()) {
            self.problem(format!("case {case}: load at node {node} must be finite"));
        }
        self.nodal
            .push((case.to_string(), node.to_string(), [fx, fy, 0.0]));
        self
    }

    /// A uniform gravity load `w` (N/m, positive downward) over the whole of `member`, along
    /// its length, in load case `case`.
    pub fn line_load(&mut self, case: &str, member: &str, w: f64) -> &mut Self {
        if !w.is_finite() {
            self.problem(format!(
                "case {case}: load on member {member} must be finite"
            ));
        }
        self.lines.push((case.to_string(), member.to_string(), w));
        self
    }

    /// The model's own combination table (a shipped name such as `asce7-16-strength`, or
    /// a path); [`Check::table`] may name another.
    pub fn table(&mut self, name: &str) -> &mut Self {
        self.table = Some(name.to_string());
        self
    }

    /// Resolve the ids and return the validated [`Model`], or the first problem found.
    pub fn build(&self) -> Result<Model, Error> {
        if let Some(p) = self.problems.first() {
            return Err(self.error(p.clone()));
        }
        for (what, ids) in [
            ("node", self.nodes.iter().map(|n| &n.id).collect::<Vec<_>>()),
            ("material", self.materials.iter().map(|m| &m.id).collect()),
            ("section", self.sections.iter().map(|s| &s.id).collect()),
            ("member", self.members.iter().map(|m| &m.id).collect()),
            ("load case", self.cases.iter().map(|c| &c.id).collect()),
        ] {
            if let Some(dup) = ids
                .iter()
                .enumerate()
                .find(|(k, id)| ids[..*k].contains(id))
            {
                return Err(self.error(format!("{what} {} is declared twice", dup.1)));
            }
        }
        let node = |id: &str| {
            self.nodes
                .iter()
                .position(|n| n.id == id)
                .ok_or_else(|| self.error(format!("no node {id}")))
        };
        let mut members = Vec::with_capacity(self.members.len());
        for m in &self.members {
            let (i, j) = (node(&m.ends[0])?, node(&m.ends[1])?);
            let material = self
                .materials
                .iter()
                .position(|x| x.id == m.material)
                .ok_or_else(|| {
                    self.error(format!("member {}: no material {}", m.id, m.material))
                })?;
            let section = self
                .sections
                .iter()
                .position(|x| x.id == m.section)
                .ok_or_else(|| self.error(format!("member {}: no section {}", m.id, m.section)))?;
            let (dx, dy) = (
                self.nodes[j].x - self.nodes[i].x,
                self.nodes[j].y - self.nodes[i].y,
            );
            if dx.hypot(dy) <= 0.0 {
                return Err(self.error(format!("member {} has zero length", m.id)));
            }
            members.push(Member {
                id: m.id.clone(),
                i,
                j,
                section,
                material,
                release_i: m.releases[0],
                release_j: m.releases[1],
                role: if dy.abs() > dx.abs() {
                    crate::model::Role::Column
                } else {
                    crate::model::Role::Beam
                },
            });
        }
        let supports = self
            .supports
            .iter()
            .map(|(n, dofs)| {
                Ok(Support {
                    node: node(n)?,
                    dofs: *dofs,
                })
            })
            .collect::<Result<Vec<_>, Error>>()?;
        let mut cases = self.cases.clone();
        let case = |id: &str| {
            self.cases
                .iter()
                .position(|c| c.id == id)
                .ok_or_else(|| self.error(format!("no load case {id}")))
        };
        for (c, n, [fx, fy, mz]) in &self.nodal {
            let node = node(n)?;
            cases[case(c)?].nodal.push(NodalLoad {
                node,
                fx: *fx,
                fy: *fy,
                mz: *mz,
            });
        }
        for (c, m, w) in &self.lines {
            let member = members
                .iter()
                .position(|x| &x.id == m)
                .ok_or_else(|| self.error(format!("case {c}: no member {m}")))?;
            let mm = &members[member];
            let (a, b) = (&self.nodes[mm.i], &self.nodes[mm.j]);
            let length = (b.x - a.x).hypot(b.y - a.y);
            cases[case(c)?].member.push(MemberLoad {
                member,
                kind: MemberLoadKind::Distributed {
                    a: 0.0,
                    b: length,
                    w_a: *w,
                    w_b: *w,
                    direction: LoadDirection::Gravity,
                    measure: Measure::AlongMember,
                },
            });
        }
        Ok(Model {
            title: self.title.clone(),
            units: UnitSystem::preset("kN-m").map_err(|e| self.error(e.to_string()))?,
            nodes: self.nodes.clone(),
            materials: self.materials.clone(),
            sections: self.sections.clone(),
            members,
            supports,
            load_cases: cases,
            combos: ComboChoice {
                table: self.table.clone(),
                ..ComboChoice::default()
            },
            analysis: AnalysisOptions::default(),
            stories: None,
        })
    }

    fn with_case(&mut self, id: &str, f: impl FnOnce(&mut LoadCase)) -> &mut Self {
        match self.cases.iter_mut().find(|c| c.id == id) {
            Some(c) => f(c),
            None => self.problem(format!("no load case {id} declared before")),
        }
        self
    }

    fn positive(&mut self, what: &str, x: f64) {
        if !(x.is_finite() && x > 0.0) {
            self.problem(format!("{what} must be a positive finite number, got {x}"));
        }
    }

    fn problem(&mut self, message: String) {
        self.problems.push(message);
    }

    fn error(&self, message: String) -> Error {
        Error::Build {
            frame: self.title.clone(),
            message,
        }
    }
}

/// A strength check of one model: which table, which method, which parameters.
///
/// `Check::new(&model).table("asce7-16-strength").method(SecondOrderMethod::AiscB1B2).run()`
/// forms the factored cases of the table from the model's load cases (live-load
/// arrangements included), analyses each and returns the [`Outcome`]. Without
/// [`Check::table`], the model's own table (`[combinations] table`) is used. The
/// serviceability half of the command line's `check` is not part of this entry point.
#[derive(Debug, Clone)]
pub struct Check<'m> {
    model: &'m Model,
    table: Option<String>,
    method: Option<SecondOrderMethod>,
    sets: BTreeMap<String, f64>,
    base_dir: Option<PathBuf>,
    name: String,
}

impl<'m> Check<'m> {
    /// A check of `model` with the model's own table and method.
    pub fn new(model: &'m Model) -> Check<'m> {
        Check {
            model,
            table: None,
            method: None,
            sets: BTreeMap::new(),
            base_dir: None,
            name: model.title.clone(),
        }
    }

    /// A shipped table name (`plumbline combos` lists them) or the path of a table file.
    pub fn table(mut self, name_or_path: &str) -> Self {
        self.table = Some(name_or_path.to_string());
        self
    }

    /// The second-order method; the stiffness and notional loads the model leaves to the
    /// method follow it.
    pub fn method(mut self, method: SecondOrderMethod) -> Self {
        self.method = Some(method);
        self
    }

    /// A table parameter's value (as `--set NAME=VALUE` on the command line).
    pub fn set(mut self, param: &str, value: f64) -> Self {
        self.sets.insert(param.to_string(), value);
        self
    }

    /// The folder relative table paths are read from (a model file's folder); also names
    /// the model in errors. [`check_file`] sets it.
    pub fn base_dir(mut self, dir: &Path) -> Self {
        self.base_dir = Some(dir.to_path_buf());
        self
    }

    /// Form the factored cases, analyse them and envelope the results.
    pub fn run(self) -> Result<Outcome, Error> {
        let mut model = self.model.clone();
        if let Some(m) = self.method {
            model.analysis.method = m;
            model.analysis.apply_method_defaults();
        }
        if model.load_cases.is_empty() {
            return Err(Error::Request(format!(
                "{}: the model has no load cases: nothing to combine or check",
                self.name
            )));
        }
        let base = self.base_dir.as_deref();
        let own = match model.combos.table.as_deref() {
            Some(name) => Some(load_table(name, base)?),
            None => None,
        };
        let table = match (&self.table, &own) {
            (Some(name), _) => load_table(name, base)?,
            (None, Some(t)) => t.clone(),
            (None, None) => {
                return Err(Error::Request(format!(
                    "{}: no combination table: name one with Check::table or in the model",
                    self.name
                )));
            }
        };
        if table.basis == Basis::Serviceability {
            return Err(Error::Request(format!(
                "{}: {} is a serviceability table; this entry point runs the strength check",
                self.name, table.file
            )));
        }
        let settings = Settings::for_model(&model, own.as_ref(), &self.sets);
        let analysis = |model: &Model, e: CheckError| Error::Analysis {
            model: model.title.clone(),
            source: e,
        };
        let arranged =
            crate::arrange::arrange_model(&model).map_err(|e| analysis(&model, e.into()))?;
        let expansion = arranged.apply(expand_with(&table, &model.load_cases, &settings)?);
        crate::arrange::within_case_limit(&expansion).map_err(|e| analysis(&model, e.into()))?;
        let model = arranged.model;
        let report =
            crate::check::check(&model, &expansion.cases).map_err(|e| analysis(&model, e))?;
        let envelope = crate::envelope::envelope(&report);
        Ok(Outcome {
            table,
            cases: expansion.cases,
            notices: expansion
                .notices
                .iter()
                .map(|n| n.message.clone())
                .collect(),
            report,
            envelope,
        })
    }
}

/// Read the model file at `path` and check it with its own table and method (relative
/// table paths are taken from the file's folder).
pub fn check_file(path: impl AsRef<Path>) -> Result<Outcome, Error> {
    let path = path.as_ref();
    let model = read_model(path)?;
    let dir = path.parent().unwrap_or(Path::new("."));
    let mut check = Check::new(&model).base_dir(dir);
    check.name = path.display().to_string();
    check.run()
}

/// What a check found. All values SI (N, N·m, m), moments as internal moments
/// (see DEVELOPERS.md, "Sign convention").
#[derive(Debug, Clone)]
pub struct Outcome {
    /// The combination table used.
    pub table: ComboTable,
    /// The factored cases formed from the table (before notional-load variants).
    pub cases: Vec<FactoredCase>,
    /// Notes of the expansion: a lateral load given from one side only, a level assumed.
    pub notices: Vec<String>,
    /// The per-case results.
    pub report: CheckReport,
    /// The envelopes over the stable cases: member moments, axial force, shear,
    /// reactions, story figures.
    pub envelope: Envelope,
}

impl Outcome {
    /// The largest design moment of every member, with its case and concurrent axial force.
    pub fn governing(&self) -> Vec<GoverningMoment> {
        crate::envelope::governing(&self.envelope.members)
    }

    /// The moment envelope of every member (each end and the span, + and −).
    pub fn members(&self) -> &[MemberEnvelope] {
        &self.envelope.members
    }

    /// The story envelopes (drift ratio, B2, Q, α_cr, sway cases), bottom story first.
    pub fn stories(&self) -> &[StoryEnvelope] {
        &self.envelope.stories
    }

    /// One sentence per story, bottom first: sway or non-sway in how many cases, and where
    /// second-order moments were used (the summary's verdict column).
    pub fn story_verdicts(&self) -> Vec<String> {
        self.envelope
            .stories
            .iter()
            .map(crate::report::summary::story_verdict)
            .collect()
    }

    /// True when no factored case is unstable.
    pub fn is_stable(&self) -> bool {
        self.envelope.unstable.is_empty()
    }

    /// The caution every output of these results must carry ([`crate::caution::CAUTION`]).
    pub fn caution(&self) -> &'static str {
        crate::caution::CAUTION
    }
}
