//! The analysis mesh: the nodes and elements the stiffness method works on.
//!
//! A first-order analysis uses one element per member (exact for prismatic members with
//! the fixed-end forces of [`super::beam`]). Second-order and buckling analyses split each
//! member into `segments` elements so that the consistent geometric stiffness also captures
//! the member's own curvature (P-δ). Mesh nodes `0..model.nodes.len()` are the model's
//! nodes, in the same order; interior nodes follow.

use std::ops::Range;

use serde::Serialize;

use crate::model::{Model, Role, StiffnessPreset};

/// Axial and flexural stiffness used in the analysis for one member.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct MemberStiffness {
    /// E·A, N.
    pub ea: f64,
    /// E·I, N·m².
    pub ei: f64,
}

/// Stiffness of every member after the model's reductions.
///
/// * [`StiffnessPreset::AciCracked`]: ACI 318-19 Table 6.6.3.1.1(a): I = 0.70 Ig for
///   columns, 0.35 Ig for beams, A = 1.0 Ag (confirmed in the reference notes §7.1).
///   Braces are taken as columns (axially loaded members, common practice, no source).
/// * [`StiffnessPreset::AiscDirect`]: AISC 360-16 §C2.3(a) 0.80 on all stiffnesses, with
///   τb = 1.0 (the additional notional load 0.001·α·Yi of §C2.3(c) is then added by the
///   load stage; notes §9).
/// * [`StiffnessPreset::AciService`]: ACI 318-19 §6.6.3.2.2, 1.4 × the values above, not
///   above Ig (from memory; reference notes §7.1 and §11), for service-load analysis.
/// * The model's `inertia_factor` by role multiplies I on top of the preset.
pub fn member_stiffness(model: &Model) -> Vec<MemberStiffness> {
    let opts = &model.analysis;
    (0..model.members.len())
        .map(|m| {
            let (ea, ei) = model.gross_stiffness(m);
            let role = model.members[m].role;
            let (fa, fi) = match opts.stiffness {
                StiffnessPreset::Gross => (1.0, 1.0),
                StiffnessPreset::AciCracked => match role {
                    Role::Beam => (1.0, 0.35),
                    Role::Column | Role::Brace => (1.0, 0.70),
                },
                StiffnessPreset::AiscDirect => (0.8, 0.8),
                // ACI 318-19 §6.6.3.2.2: 1.4 × Table 6.6.3.1.1(a), not above Ig (from memory).
                StiffnessPreset::AciService => match role {
                    Role::Beam => (1.0, (1.4_f64 * 0.35).min(1.0)),
                    Role::Column | Role::Brace => (1.0, (1.4_f64 * 0.70).min(1.0)),
                },
            };
            let user = opts
                .inertia_factor
                .get(&role.to_string())
                .copied()
                .unwrap_or(1.0);
            MemberStiffness {
                ea: fa * ea,
                ei: fi * user * ei,
            }
        })
        .collect()
}

/// One element of the mesh.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Element {
    /// The member it belongs to.
    pub member: usize,
    /// Mesh nodes at its ends.
    pub i: usize,
    pub j: usize,
    /// Distance of its end i from the member's end i, m.
    pub x0: f64,
    /// Length, m.
    pub length: f64,
    /// Direction cosines of i→j.
    pub c: f64,
    pub s: f64,
    pub ea: f64,
    pub ei: f64,
    /// Moment releases at its ends (only at the member's own ends).
    pub release: [bool; 2],
}

/// Nodes and elements of one analysis.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Mesh {
    /// Coordinates of the mesh nodes, m.
    pub nodes: Vec<(f64, f64)>,
    /// How many of the first nodes are the model's nodes.
    pub model_nodes: usize,
    pub elements: Vec<Element>,
    /// The elements of each member, in order from its end i.
    pub member_elements: Vec<Range<usize>>,
}

impl Mesh {
    /// Build the mesh with `segments` (≥ 1) elements per member.
    pub fn new(model: &Model, stiffness: &[MemberStiffness], segments: usize) -> Mesh {
        let segments = segments.max(1);
        let mut nodes: Vec<(f64, f64)> =
            Vec::with_capacity(model.nodes.len() + model.members.len() * (segments - 1));
        nodes.extend(model.nodes.iter().map(|n| (n.x, n.y)));
        let mut elements = Vec::with_capacity(model.members.len() * segments);
        let mut member_elements = Vec::with_capacity(model.members.len());
        for (m, mem) in model.members.iter().enumerate() {
            let (c, s) = model.cosines(m);
            let l = model.length(m);
            let (xi, yi) = nodes[mem.i];
            let h = l / segments as f64;
            let start = elements.len();
            let mut prev = mem.i;
            for k in 0..segments {
                let next = if k + 1 == segments {
                    mem.j
                } else {
                    let t = h * (k + 1) as f64;
                    nodes.push((xi + c * t, yi + s * t));
                    nodes.len() - 1
                };
                elements.push(Element {
                    member: m,
                    i: prev,
                    j: next,
                    x0: h * k as f64,
                    length: h,
                    c,
                    s,
                    ea: stiffness[m].ea,
                    ei: stiffness[m].ei,
                    release: [k == 0 && mem.release_i, k + 1 == segments && mem.release_j],
                });
                prev = next;
            }
            member_elements.push(start..elements.len());
        }
        Mesh {
            nodes,
            model_nodes: model.nodes.len(),
            elements,
            member_elements,
        }
    }

    /// Describe mesh node `n` for messages: the model node's id, or the point of the
    /// member it lies on.
    pub fn describe_node(&self, model: &Model, n: usize) -> String {
        if n < self.model_nodes {
            return format!("node {}", model.nodes[n].id);
        }
        match self.elements.iter().find(|e| e.i == n) {
            Some(e) => format!(
                "the point of member {} at {:.3} m from its end i",
                model.members[e.member].id, e.x0
            ),
            None => format!("mesh node {n}"),
        }
    }
}
