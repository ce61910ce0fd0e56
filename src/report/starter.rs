//! The commented starter model that `plumbline new` writes for a regular frame.
//!
//! Every value carries its unit (a quantity string) except the bay widths and story
//! heights, which are in the preset's length unit as given on the command line. The
//! section properties and loads are placeholders to replace, and say so.

/// Options of [`crate::app::new_model`].
#[derive(Debug, Clone)]
pub struct NewArgs {
    /// Bay widths, left to right, in the preset's length unit.
    pub bays: Vec<f64>,
    /// Story heights, bottom up.
    pub stories: Vec<f64>,
    /// Unit preset name (`kN-m`, `kip-ft`, `kip-in`, `N-mm`).
    pub units: String,
    /// `fixed` or `pinned`.
    pub base: String,
}

/// Illustrative values for one unit family: material, two sections, loads, table, method.
struct Starter {
    e: &'static str,
    unit_weight: &'static str,
    column: [&'static str; 3],
    beam: [&'static str; 3],
    dead: &'static str,
    live: &'static str,
    wind: &'static str,
    table: &'static str,
    method: &'static str,
}

/// The placeholders for a preset: US customary for `kip-*`, SI otherwise.
fn starter_for(units: &str) -> Starter {
    if units.starts_with("kip") {
        Starter {
            e: "29000 ksi",
            unit_weight: "490 lbf/ft^3",
            column: ["15.6 in^2", "425 in^4", "12.1 in"],
            beam: ["13.0 in^2", "843 in^4", "20.7 in"],
            dead: "1.5 kip/ft",
            live: "1.0 kip/ft",
            wind: "4.0 kip",
            table: "asce7-16-strength",
            method: "aisc-b1b2",
        }
    } else {
        Starter {
            e: "210 GPa",
            unit_weight: "78.5 kN/m^3",
            column: ["86.8 cm^2", "10450 cm^4", "250 mm"],
            beam: ["84.5 cm^2", "23130 cm^4", "400 mm"],
            dead: "20 kN/m",
            live: "10 kN/m",
            wind: "15 kN",
            table: "en1990-6.10",
            method: "ec3-alpha-cr",
        }
    }
}

/// A list of lengths as TOML: `[7.5, 6, 7.5]`.
fn list(v: &[f64]) -> String {
    let items: Vec<String> = v.iter().map(|x| format!("{x}")).collect();
    format!("[{}]", items.join(", "))
}

/// The starter model text.
pub fn starter_model(a: &NewArgs) -> String {
    let s = starter_for(&a.units);
    let levels = a.stories.len();
    let windward: Vec<String> = (1..=levels).map(|k| format!("\"N1.{k}\"")).collect();
    let leeward: Vec<String> = (1..=levels)
        .map(|k| format!("\"N{}.{k}\"", a.bays.len() + 1))
        .collect();
    format!(
        r#"# Starter model written by `plumbline new`: a regular frame of {bays} bay(s) and
# {stories} story(ies). Replace every placeholder value (sections, loads, table, method)
# with the building's own before relying on any result. The format is described in
# docs/model-file.md.
#
# Results assist a licensed engineer and do not replace one: local codes and the adopted
# edition of each standard govern.

title = "New frame"
units = "{units}"        # bare numbers below are read in this preset's units

[[material]]
id = "steel"
E = "{e}"
unit_weight = "{uw}"     # for self_weight = true

# Placeholder sections: check the properties against a section table.
[[section]]
id = "col"
A = "{ca}"
I = "{ci}"
depth = "{cd}"
role = "column"

[[section]]
id = "beam"
A = "{ba}"
I = "{bi}"
depth = "{bd}"
role = "beam"

# Generated ids: nodes N{{grid}}.{{level}} (N1.0 at the origin), columns C{{grid}}.{{story}},
# beams B{{bay}}.{{level}}.
[frame]
bays = {bay_list}        # widths, left to right
stories = {story_list}   # heights, bottom up
base = "{base}"          # fixed | pinned
material = "steel"
columns = ["col"]        # one section for every story, or one per story
beams = ["beam"]

[[case]]
id = "D"
description = "self-weight and superimposed dead load (placeholder)"
category = "dead"
self_weight = true

[[case.member_load]]
members = "B*"           # every beam
kind = "uniform"
direction = "down"       # positive downward
w = "{dead}"

[[case]]
id = "L"
description = "floor live load (placeholder)"
category = "live"

[[case.member_load]]
members = "B*"
kind = "uniform"
direction = "down"
w = "{live}"

[[case]]
id = "W-left"
description = "wind from the left (placeholder story forces)"
category = "wind"
alternative = "wind"     # W-left and W-right never act together

[[case.node_load]]
nodes = [{windward}]
fx = "{wind}"            # +X to the right

[[case]]
id = "W-right"
description = "wind from the right (placeholder story forces)"
category = "wind"
alternative = "wind"

[[case.node_load]]
nodes = [{leeward}]
fx = "-{wind}"

[combinations]
table = "{table}"        # `plumbline combos` lists the shipped tables

[analysis]
method = "{method}"      # aisc-b1b2 | aci-magnifier | ec3-alpha-cr | direct
"#,
        bays = a.bays.len(),
        stories = levels,
        units = a.units,
        e = s.e,
        uw = s.unit_weight,
        ca = s.column[0],
        ci = s.column[1],
        cd = s.column[2],
        ba = s.beam[0],
        bi = s.beam[1],
        bd = s.beam[2],
        bay_list = list(&a.bays),
        story_list = list(&a.stories),
        base = a.base,
        dead = s.dead,
        live = s.live,
        windward = windward.join(", "),
        leeward = leeward.join(", "),
        wind = s.wind,
        table = s.table,
        method = s.method,
    )
}
