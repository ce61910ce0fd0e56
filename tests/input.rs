//! Model file reading: shipped examples, the frame generator, quantity strings and every
//! validation error with its line number.

mod common;

use common::verify;
use plumbline::input::{load_model, parse_model};
use plumbline::model::{LoadDirection, Measure, MemberLoadKind, Restraint, Role};
use std::path::Path;

fn example(name: &str) -> plumbline::model::Model {
    let path = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("examples")
        .join(name);
    load_model(&path).unwrap_or_else(|e| panic!("{name}: {e}"))
}

#[test]
fn every_example_parses() {
    for name in [
        "workshop-portal.toml",
        "retail-2story.toml",
        "gable-frame.toml",
        "office-3story.toml",
    ] {
        let m = example(name);
        assert!(!m.load_cases.is_empty(), "{name}");
        assert!(m.combos.table.is_some(), "{name}");
    }
}

#[test]
fn readme_clinic_example_parses_with_consistent_sections() {
    // The guided tour's complete model (docs/model-guide.md) must stay a valid model file.
    let readme = include_str!("../docs/model-guide.md");
    let start = readme
        .find("title = \"Two-story clinic")
        .expect("clinic example");
    let end = start + readme[start..].find("```").expect("end of the example");
    let m =
        parse_model(&readme[start..end], "docs/model-guide.md").unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(m.members.len(), 6);
    // Each section is one shape (illustrative values, from memory): a 250 mm wide-flange
    // column with A = 86.8 cm², I = 10450 cm⁴; a 400 mm I-beam with A = 84.5 cm²,
    // I = 23130 cm⁴ (1 cm² = 1e-4 m², 1 cm⁴ = 1e-8 m⁴). Tolerances relative to each value,
    // the former absolute 1e-9 m² and 1e-12 m⁴ rounded down to a power of ten.
    verify::source("closed form, SI prefixes: 1 cm² = 1e-4 m², 1 cm⁴ = 1e-8 m⁴");
    let col = &m.sections[0];
    verify::close("guide's column A = 86.8 cm²", "m²", col.area, 86.8e-4, 1e-7);
    verify::close(
        "guide's column I = 10450 cm⁴",
        "m⁴",
        col.inertia,
        10450e-8,
        1e-9,
    );
    let girder = &m.sections[1];
    verify::close(
        "guide's girder A = 84.5 cm²",
        "m²",
        girder.area,
        84.5e-4,
        1e-7,
    );
    verify::close(
        "guide's girder I = 23130 cm⁴",
        "m⁴",
        girder.inertia,
        23130e-8,
        1e-9,
    );
}

/// A small valid model (kN-m): column a–b, beam b–c, fixed base at a. Tests append to it
/// or replace parts of it.
const BASE: &str = r#"units = "kN-m"

[[material]]
id = "steel"
E = "210 GPa"
unit_weight = 78.5

[[section]]
id = "s1"
A = 10000
I = 1e8

[[node]]
id = "a"
x = 0
y = 0

[[node]]
id = "b"
x = 0
y = 4

[[node]]
id = "c"
x = 6
y = 4

[[member]]
id = "m1"
i = "a"
j = "b"
section = "s1"
material = "steel"

[[member]]
id = "m2"
i = "b"
j = "c"
section = "s1"
material = "steel"

[[support]]
node = "a"
type = "fixed"
"#;

/// 1-based number of the first line of `text` containing `marker`.
fn line_of(text: &str, marker: &str) -> usize {
    text.lines()
        .position(|l| l.contains(marker))
        .expect("marker in text")
        + 1
}

/// Parse `text`, expect an error on the line marked `# <-`, and return its message.
fn error_on_marked_line(text: &str) -> String {
    let e = match parse_model(text, "test.toml") {
        Ok(_) => panic!("expected an error in:\n{text}"),
        Err(e) => e,
    };
    assert_eq!(e.file, "test.toml");
    assert_eq!(e.line, line_of(text, "# <-"), "wrong line for: {e}");
    assert!(e.column >= 1, "{e}");
    e.to_string()
}

/// BASE with `from` replaced by `to` (which must occur in BASE).
fn base_with(from: &str, to: &str) -> String {
    assert!(BASE.contains(from), "{from}");
    BASE.replacen(from, to, 1)
}

/// BASE with one load case holding `loads` appended.
fn base_with_case(loads: &str) -> String {
    format!("{BASE}\n[[case]]\nid = \"D\"\ncategory = \"dead\"\n{loads}\n")
}

#[test]
fn base_model_is_valid() {
    let m = parse_model(BASE, "base.toml").unwrap();
    assert_eq!(m.nodes.len(), 3);
    assert_eq!(m.members[0].role, Role::Column);
    assert_eq!(m.members[1].role, Role::Beam);
    // 210 GPa = 210e9 Pa; 10000 mm² = 0.01 m²; 1e8 mm⁴ = 1e-4 m⁴ (closed form, SI prefixes).
    // Tolerances relative to each value, the former absolute ones rounded down to a power
    // of ten.
    verify::source("closed form, SI prefixes (kN-m preset: sections in mm)");
    verify::close("E = 210 GPa", "Pa", m.materials[0].e, 210e9, 0.0);
    verify::close("A = 10000 mm²", "m²", m.sections[0].area, 0.01, 1e-13);
    verify::close("I = 1e8 mm⁴", "m⁴", m.sections[0].inertia, 1e-4, 1e-14);
    // 78.5 kN/m³ = 78 500 N/m³.
    verify::close(
        "unit weight 78.5 kN/m³",
        "N/m³",
        m.materials[0].unit_weight.unwrap(),
        78_500.0,
        1e-14,
    );
}

// ---------- validation errors, each with its line ----------

#[test]
fn toml_syntax_error() {
    let t = base_with("x = 6\n", "x = = 6 # <-\n");
    let msg = error_on_marked_line(&t);
    assert!(msg.contains(": x: "), "{msg}");
}

#[test]
fn unknown_key() {
    let t = base_with(
        "section = \"s1\"\nmaterial",
        "sectoin = \"s1\" # <-\nmaterial",
    );
    let msg = error_on_marked_line(&t);
    assert!(msg.contains("sectoin"), "{msg}");
}

#[test]
fn unknown_node_in_member() {
    let t = base_with("j = \"c\"", "j = \"cc\" # <-");
    let msg = error_on_marked_line(&t);
    assert!(
        msg.contains("unknown node \"cc\"") && msg.contains("expected one of"),
        "{msg}"
    );
}

#[test]
fn unknown_section_and_material() {
    let t = base_with(
        "section = \"s1\"\nmaterial = \"steel\"\n\n[[support]]",
        "section = \"s2\" # <-\nmaterial = \"steel\"\n\n[[support]]",
    );
    assert!(error_on_marked_line(&t).contains("unknown section \"s2\""));
    let t = base_with(
        "material = \"steel\"\n\n[[support]]",
        "material = \"iron\" # <-\n\n[[support]]",
    );
    assert!(error_on_marked_line(&t).contains("unknown material \"iron\""));
}

#[test]
fn duplicate_ids() {
    let t = base_with("id = \"c\"", "id = \"b\" # <-");
    let msg = error_on_marked_line(&t);
    assert!(
        msg.contains("duplicate node id \"b\"") && msg.contains("line 19"),
        "{msg}"
    );
    let t = base_with("id = \"m2\"", "id = \"m1\" # <-");
    assert!(error_on_marked_line(&t).contains("duplicate member id"));
    let t = format!("{BASE}\n[[section]]\nid = \"s1\" # <-\nA = 1\nI = 1\n");
    assert!(error_on_marked_line(&t).contains("duplicate section id"));
    let t = format!(
        "{BASE}\n[[case]]\nid = \"D\"\ncategory = \"dead\"\n[[case]]\nid = \"D\" # <-\ncategory = \"live\"\n"
    );
    assert!(error_on_marked_line(&t).contains("duplicate load case id"));
}

#[test]
fn zero_length_member() {
    let t = format!(
        "{BASE}\n[[member]]\nid = \"m3\" # <-\ni = \"c\"\nj = \"c\"\nsection = \"s1\"\nmaterial = \"steel\"\n"
    );
    let msg = error_on_marked_line(&t);
    assert!(msg.contains("zero length"), "{msg}");
    // Two distinct nodes at the same place.
    let t = format!(
        "{BASE}\n[[node]]\nid = \"c2\"\nx = 6\ny = 4\n[[member]]\nid = \"m3\" # <-\ni = \"c\"\nj = \"c2\"\nsection = \"s1\"\nmaterial = \"steel\"\n"
    );
    assert!(error_on_marked_line(&t).contains("zero length"));
}

#[test]
fn overlapping_members() {
    // m3 runs from b along the beam to its midpoint: it shares 3 m with m2.
    let t = format!(
        "{BASE}\n[[node]]\nid = \"d\"\nx = 3\ny = 4\n[[member]]\nid = \"m3\" # <-\ni = \"b\"\nj = \"d\"\nsection = \"s1\"\nmaterial = \"steel\"\n"
    );
    let msg = error_on_marked_line(&t);
    assert!(msg.contains("overlaps member \"m2\" over 3 m"), "{msg}");
}

#[test]
fn node_on_member_interior_not_connected() {
    // A brace from the base ends at the midpoint of beam m2 without splitting it.
    let t = format!(
        "{BASE}\n[[node]]\nid = \"mid\" # <-\nx = 3\ny = 4\n[[node]]\nid = \"e\"\nx = 6\ny = 0\n\
         [[member]]\nid = \"brace\"\ni = \"e\"\nj = \"mid\"\nsection = \"s1\"\nmaterial = \"steel\"\nhinge = \"both\"\n"
    );
    let msg = error_on_marked_line(&t);
    assert!(msg.contains("lies on member \"m2\" at 3 m"), "{msg}");
}

#[test]
fn node_without_members() {
    let t = format!("{BASE}\n[[node]]\nid = \"lonely\" # <-\nx = 9\ny = 9\n");
    assert!(error_on_marked_line(&t).contains("not connected to any member"));
}

#[test]
fn pin_ended_brace_is_allowed() {
    let t = format!(
        "{BASE}\n[[node]]\nid = \"e\"\nx = 6\ny = 0\n[[member]]\nid = \"brace\"\ni = \"e\"\nj = \"c\"\n\
         section = \"s1\"\nmaterial = \"steel\"\nhinge = \"both\"\n[[support]]\nnode = \"e\"\ntype = \"pinned\"\n"
    );
    let m = parse_model(&t, "t.toml").unwrap();
    let b = &m.members[m.member_index("brace").unwrap()];
    assert!(b.release_i && b.release_j);
    // 45° or steeper: column unless the section says otherwise (here 4 m rise on 0 run).
    assert_eq!(b.role, Role::Column);
}

#[test]
fn load_positions_outside_the_member() {
    // m2 is 6 m long.
    let point = |at: &str| {
        base_with_case(&format!(
            "[[case.member_load]]\nmembers = \"m2\"\nkind = \"point\"\ndirection = \"down\"\np = 10\nat = {at} # <-\n"
        ))
    };
    let msg = error_on_marked_line(&point("6.5"));
    assert!(msg.contains("expected 0 ≤ at ≤ L = 6 m"), "{msg}");
    error_on_marked_line(&point("-0.1"));
    error_on_marked_line(&point("\"1.2L\""));
    let part = |from: &str, to: &str| {
        base_with_case(&format!(
            "[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\"\ndirection = \"down\"\nw = 5\n{from}\n{to}\n"
        ))
    };
    error_on_marked_line(&part("from = -1 # <-", "to = 3"));
    error_on_marked_line(&part("from = 1", "to = 7 # <-"));
    let msg = error_on_marked_line(&part("from = 4", "to = 3 # <-"));
    assert!(msg.contains("expected from < to"), "{msg}");
    error_on_marked_line(&part("from = 3", "to = 3 # <-"));
}

#[test]
fn non_positive_stiffness() {
    assert!(
        error_on_marked_line(&base_with("E = \"210 GPa\"", "E = 0 # <-"))
            .contains("greater than zero, got 0 MPa")
    );
    error_on_marked_line(&base_with("A = 10000", "A = -5 # <-"));
    error_on_marked_line(&base_with("I = 1e8", "I = 0.0 # <-"));
    error_on_marked_line(&base_with("unit_weight = 78.5", "unit_weight = -1 # <-"));
    let t = base_with("type = \"fixed\"", "type = \"pinned\"\nkr = -200 # <-");
    error_on_marked_line(&t);
}

#[test]
fn nan_and_infinite_values() {
    error_on_marked_line(&base_with("x = 6", "x = nan # <-"));
    error_on_marked_line(&base_with(
        "y = 4\n\n[[node]]\nid = \"c\"",
        "y = inf # <-\n\n[[node]]\nid = \"c\"",
    ));
    let msg = error_on_marked_line(&base_with("E = \"210 GPa\"", "E = \"1e400 GPa\" # <-"));
    assert!(msg.contains("finite"), "{msg}");
}

#[test]
fn model_without_supports() {
    let t = BASE.replace("[[support]]\nnode = \"a\"\ntype = \"fixed\"\n", "");
    let t = format!("# <- the error points at the start of the file\n{t}");
    let msg = error_on_marked_line(&t);
    assert!(msg.contains("no supports"), "{msg}");
}

#[test]
fn load_case_with_unknown_member_or_node() {
    let t = base_with_case(
        "[[case.member_load]]\nmembers = \"m9\" # <-\nkind = \"uniform\"\ndirection = \"down\"\nw = 1\n",
    );
    assert!(error_on_marked_line(&t).contains("unknown member \"m9\""));
    let t = base_with_case("[[case.node_load]]\nnodes = [\"b\", \"q\"] # <-\nfx = 1\n");
    assert!(error_on_marked_line(&t).contains("unknown node \"q\""));
    let t = base_with_case(
        "[[case.member_load]]\nmembers = \"B*.9\" # <-\nkind = \"uniform\"\ndirection = \"down\"\nw = 1\n",
    );
    assert!(error_on_marked_line(&t).contains("pattern \"B*.9\" matches no member"));
}

#[test]
fn wrong_dimension_says_what_was_expected() {
    let t = base_with_case(
        "[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\"\ndirection = \"down\"\nw = \"12 kN*m\" # <-\n",
    );
    let msg = error_on_marked_line(&t);
    assert!(
        msg.contains("expected a line load (force/length), got kN*m"),
        "{msg}"
    );
    let t = base_with("I = 1e8", "I = \"8000 cm^3\" # <-");
    assert!(
        error_on_marked_line(&t).contains("expected a second moment of area (length^4), got cm^3")
    );
}

#[test]
fn unknown_unit_and_unit_system() {
    let t = base_with("E = \"210 GPa\"", "E = \"210 GPascal\" # <-");
    assert!(error_on_marked_line(&t).contains("unknown unit \"GPascal\""));
    let t = base_with("units = \"kN-m\"", "units = \"metric\" # <-");
    assert!(error_on_marked_line(&t).contains("expected one of kN-m, kip-ft, kip-in, N-mm"));
    let t = base_with(
        "units = \"kN-m\"",
        "units = { preset = \"kN-m\", deflection = \"kN\" } # <-",
    );
    assert!(error_on_marked_line(&t).contains("expected a displacement (length), got kN"));
    let t = base_with(
        "units = \"kN-m\"",
        "# <- missing units point at the file start",
    );
    assert!(error_on_marked_line(&t).contains("missing units"));
}

#[test]
fn unknown_choices() {
    let t = format!("{BASE}\n[[case]]\nid = \"X\"\ncategory = \"imposed\" # <-\n");
    let msg = error_on_marked_line(&t);
    assert!(
        msg.contains("dead, live, roof-live, snow, rain, wind, seismic, temperature"),
        "{msg}"
    );
    error_on_marked_line(&base_with("type = \"fixed\"", "type = \"clamped\" # <-"));
    let t = base_with(
        "material = \"steel\"\n\n[[member]]",
        "material = \"steel\"\nhinge = \"middle\" # <-\n\n[[member]]",
    );
    error_on_marked_line(&t);
    let t = base_with_case(
        "[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\"\ndirection = \"downward\" # <-\nw = 1\n",
    );
    assert!(error_on_marked_line(&t).contains("local-x, local-y, global-x, global-y, down"));
    let t = base_with_case(
        "[[case.member_load]]\nmembers = \"m2\"\nkind = \"triangle\" # <-\ndirection = \"down\"\nw = 1\n",
    );
    error_on_marked_line(&t);
    let t = format!("{BASE}\n[analysis]\nmethod = \"exact\" # <-\n");
    assert!(error_on_marked_line(&t).contains("aisc-b1b2, aci-magnifier, ec3-alpha-cr, direct"));
    let t = format!("{BASE}\n[analysis]\nbeta_dns = 1.5 # <-\n");
    error_on_marked_line(&t);
    let t = format!("{BASE}\n[analysis]\ninertia_factor = {{ girder = 0.5 }} # <-\n");
    error_on_marked_line(&t);
}

#[test]
fn load_fields_must_fit_the_kind() {
    let t = base_with_case(
        "[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\"\ndirection = \"down\"\nw = 1\np = 3 # <-\n",
    );
    assert!(error_on_marked_line(&t).contains("`p` does not apply to a uniform load"));
    let t = base_with_case(
        "[[case.member_load]]\nmembers = \"m2\"\nkind = \"point\" # <-\ndirection = \"down\"\np = 3\n",
    );
    assert!(error_on_marked_line(&t).contains("needs `at`"));
    let t =
        base_with_case("[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\" # <-\nw = 3\n");
    assert!(error_on_marked_line(&t).contains("needs `direction`"));
    let t = base_with_case(
        "[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\"\ndirection = \"local-y\"\nspread_over = \"projection\" # <-\nw = 3\n",
    );
    assert!(error_on_marked_line(&t).contains("global direction"));
    let t = base_with_case("[[case.node_load]]\nnodes = \"b\" # <-\n");
    assert!(error_on_marked_line(&t).contains("at least one of fx, fy, mz"));
}

#[test]
fn former_member_load_keys_name_their_new_spelling() {
    let t = base_with_case(
        "[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\"\ndirection = \"gravity\" # <-\nw = 3\n",
    );
    let e = error_on_marked_line(&t);
    assert!(e.contains("direction = \"down\""), "{e}");
    let t = base_with_case(
        "[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\"\ndirection = \"down\"\nmeasure = \"projected\" # <-\nw = 3\n",
    );
    let e = error_on_marked_line(&t);
    assert!(e.contains("spread_over = \"projection\""), "{e}");
    let t = base_with_case(
        "[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\"\ndirection = \"down\"\nspread_over = \"plan\" # <-\nw = 3\n",
    );
    assert!(error_on_marked_line(&t).contains("member, projection"));
}

#[test]
fn self_weight_needs_unit_weight() {
    let t = base_with("unit_weight = 78.5\n", "");
    let t = format!("{t}\n[[case]]\nid = \"D\"\ncategory = \"dead\"\nself_weight = true # <-\n");
    let msg = error_on_marked_line(&t);
    assert!(msg.contains("unit weight of material \"steel\""), "{msg}");
}

#[test]
fn supports_are_checked() {
    let t = format!("{BASE}\n[[support]]\nnode = \"a\" # <-\ntype = \"pinned\"\n");
    assert!(error_on_marked_line(&t).contains("already has a support"));
    let t = format!("{BASE}\n[[support]]\nnode = \"c\" # <-\n");
    assert!(error_on_marked_line(&t).contains("restrains nothing"));
    let t = format!("{BASE}\n[[support]]\nnode = \"zz\" # <-\ntype = \"pinned\"\n");
    assert!(error_on_marked_line(&t).contains("unknown node \"zz\""));
}

#[test]
fn alternative_group_keeps_one_category() {
    let t = format!(
        "{BASE}\n[[case]]\nid = \"W1\"\ncategory = \"wind\"\nalternative = \"lateral\"\n\
         [[case]]\nid = \"E1\"\ncategory = \"seismic\"\nalternative = \"lateral\" # <-\n"
    );
    assert!(error_on_marked_line(&t).contains("share one category"));
}

#[test]
fn generator_lists_are_checked() {
    let frame = |body: &str| {
        format!(
            "units = \"kN-m\"\n[[material]]\nid = \"st\"\nE = 210000\n[[section]]\nid = \"c\"\nA = 1e4\nI = 1e8\n\
         [frame]\n{body}\n"
        )
    };
    let t = frame(
        "bays = [6, 6]\nstories = [4, 3, 3]\nbase = \"fixed\"\nmaterial = \"st\"\ncolumns = [\"c\", \"c\"] # <-\nbeams = [\"c\"]",
    );
    assert!(error_on_marked_line(&t).contains("expected 1 section (every story) or 3"));
    let t = frame(
        "bays = [6, 0] # <-\nstories = [4]\nbase = \"fixed\"\nmaterial = \"st\"\ncolumns = [\"c\"]\nbeams = [\"c\"]",
    );
    error_on_marked_line(&t);
    let t = frame(
        "bays = [6]\nstories = [4]\nbase = \"sliding\" # <-\nmaterial = \"st\"\ncolumns = [\"c\"]\nbeams = [\"c\"]",
    );
    error_on_marked_line(&t);
    let t = frame(
        "bays = [6]\nstories = [4]\nbase = \"fixed\"\nmaterial = \"st\"\ncolumns = [\"W8\"] # <-\nbeams = [\"c\"]",
    );
    assert!(error_on_marked_line(&t).contains("unknown section \"W8\""));
}

// ---------- generator ----------

const TWO_BAY_THREE_STORY: &str = r#"units = "kN-m"
[[material]]
id = "S355"
E = 210000
unit_weight = 78.5
[[section]]
id = "col-low"
A = 14900
I = 251.7e6
[[section]]
id = "col-up"
A = 11840
I = 149.2e6
[[section]]
id = "beam"
A = 8446
I = 231.3e6
[frame]
bays = [6, 7.5]
stories = [4.5, 3.5, 3.5]
base = "pinned"
material = "S355"
columns = ["col-low", "col-up", "col-up"]
beams = ["beam"]

[[member]]
id = "brace"
i = "N1.0"
j = "N2.1"
section = "beam"
material = "S355"
hinge = "both"

[[case]]
id = "L"
category = "live"
[[case.member_load]]
members = "B*.2"
kind = "uniform"
direction = "down"
w = 10
"#;

#[test]
fn generator_ids_and_geometry() {
    let m = parse_model(TWO_BAY_THREE_STORY, "gen.toml").unwrap();
    // 3 grid lines × 4 levels; 3 × 3 columns + 2 × 3 beams + 1 brace.
    assert_eq!(m.nodes.len(), 12);
    assert_eq!(m.members.len(), 16);
    let node = |id: &str| {
        let n = &m.nodes[m.node_index(id).unwrap_or_else(|| panic!("{id}"))];
        (n.x, n.y)
    };
    assert_eq!(node("N1.0"), (0.0, 0.0));
    assert_eq!(node("N2.1"), (6.0, 4.5));
    assert_eq!(node("N3.3"), (13.5, 11.5));
    let ends = |id: &str| {
        let mem = &m.members[m.member_index(id).unwrap_or_else(|| panic!("{id}"))];
        (
            m.nodes[mem.i].id.as_str(),
            m.nodes[mem.j].id.as_str(),
            m.sections[mem.section].id.as_str(),
            mem.role,
        )
    };
    assert_eq!(ends("C1.1"), ("N1.0", "N1.1", "col-low", Role::Column));
    assert_eq!(ends("C2.3"), ("N2.2", "N2.3", "col-up", Role::Column));
    assert_eq!(ends("B2.1"), ("N2.1", "N3.1", "beam", Role::Beam));
    assert_eq!(ends("B1.3"), ("N1.3", "N2.3", "beam", Role::Beam));
    // A brace rising 4.5 on 6 is within 45° of horizontal: beam by orientation (no hint).
    assert_eq!(ends("brace").3, Role::Beam);
    // Pinned bases at the three grid lines.
    assert_eq!(m.supports.len(), 3);
    for s in &m.supports {
        assert!(m.nodes[s.node].id.ends_with(".0"));
        assert_eq!(
            s.dofs,
            [Restraint::Fixed, Restraint::Fixed, Restraint::Free]
        );
    }
    // "B*.2" selects both beams of level 2, and nothing else.
    let loaded: Vec<&str> = m.load_cases[0]
        .member
        .iter()
        .map(|l| m.members[l.member].id.as_str())
        .collect();
    assert_eq!(loaded, ["B1.2", "B2.2"]);
}

#[test]
fn demo_frame_self_weight_and_patterns() {
    let m = example("office-3story.toml");
    assert_eq!(m.members.len(), 9 + 6);
    let d = &m.load_cases[m.case_index("D").unwrap()];
    // 4 floor beams + 2 roof beams + self-weight on all 15 members.
    assert_eq!(d.member.len(), 4 + 2 + 15);
    // Self-weight of C1.1 (W12x53, A = 15.6 in²) with γ = 490 lbf/ft³:
    // w = 490 × 15.6 / 144 lbf/ft (closed form), in N/m with 1 lbf = 4.4482216152605 N,
    // 1 ft = 0.3048 m.
    let c11 = m.member_index("C1.1").unwrap();
    let sw = d.member.iter().rev().find(|l| l.member == c11).unwrap();
    let MemberLoadKind::Distributed { w_a, direction, .. } = sw.kind else {
        panic!()
    };
    let expected = 490.0 * 15.6 / 144.0 * 4.448_221_615_260_5 / 0.3048;
    verify::source(
        "closed form: self weight w = γ·A; NIST SP 811 (2008) App. B exact definitions of lbf and ft",
    );
    verify::close(
        "self weight of C1.1, 490 lbf/ft³ × 15.6 in²",
        "N/m",
        w_a,
        expected,
        1e-12,
    );
    assert_eq!(direction, LoadDirection::Gravity);
    let wl = &m.load_cases[m.case_index("WL").unwrap()];
    assert_eq!(wl.alternative_group.as_deref(), Some("wind"));
    assert_eq!(m.stories.as_ref().unwrap().levels.len(), 3);
}

#[test]
fn gable_frame_hinge_and_projected_snow() {
    let m = example("gable-frame.toml");
    let r = &m.members[m.member_index("rafter-L").unwrap()];
    assert!(!r.release_i && r.release_j);
    assert_eq!(r.role, Role::Beam);
    let s = &m.load_cases[m.case_index("S").unwrap()];
    assert!(s.member.iter().all(|l| matches!(
        l.kind,
        MemberLoadKind::Distributed {
            measure: Measure::Projected,
            ..
        }
    )));
    // "0.5L" on a rafter of length √(8² + 2²) m.
    let g = &m.load_cases[m.case_index("G").unwrap()];
    let p = g.member.iter().find_map(|l| match l.kind {
        MemberLoadKind::Point { a, .. } => Some(a),
        _ => None,
    });
    verify::source("closed form: rafter length √(8² + 2²) m");
    // Relative to the rafter's half length, the former absolute 1e-12 m rounded down.
    verify::close(
        "position of a load at 0.5L on a rafter",
        "m",
        p.unwrap(),
        0.5 * 68f64.sqrt(),
        1e-13,
    );
}

// ---------- quantity strings in every field ----------

const ALL_STRINGS: &str = r#"units = "kip-ft"
[[material]]
id = "m"
E = "200 GPa"
unit_weight = "77 kN/m^3"
[[section]]
id = "s"
A = "100 cm^2"
I = "8000 cm^4"
depth = "300 mm"
[frame]
bays = ["6 m"]
stories = ["4000 mm"]
base = "fixed"
material = "m"
columns = ["s"]
beams = ["s"]
origin = ["1 m", "0.5 m"]
[[node]]
id = "tip"
x = "9 m"
y = "4.5 m"
[[member]]
id = "canopy"
i = "N2.1"
j = "tip"
section = "s"
material = "m"
[[support]]
node = "tip"
kx = "2000 kN/m"
ky = "3 MN/m"
kr = "500 kN*m/rad"
[[case]]
id = "Q"
category = "live"
[[case.node_load]]
nodes = "N1.1"
fx = "10 kN"
fy = "-2000 N"
mz = "5 kN·m"
[[case.member_load]]
members = "B1.1"
kind = "uniform"
direction = "down"
w = "12 kN/m"
from = "1 m"
to = "5000 mm"
[[case.member_load]]
members = "B1.1"
kind = "linear"
direction = "local-y"
w_from = "2 kN/m"
w_to = "4 N/mm"
[[case.member_load]]
members = "B1.1"
kind = "point"
direction = "global-x"
p = "7 kN"
at = "250 cm"
[[case.member_load]]
members = "B1.1"
kind = "moment"
m = "3 kN*m"
at = "2 m"
[combinations]
table = "en1990-6.10"
params = { psi = "0.7" }
[analysis]
notional = "aisc"
notional_coefficient = "0.003"
beta_dns = "0.5"
inertia_factor = { column = "0.8" }
story_levels = ["4.5 m"]
"#;

#[test]
fn quantity_strings_in_every_field() {
    let m = parse_model(ALL_STRINGS, "strings.toml").unwrap();
    // SI prefixes and cm = 0.01 m (closed form). Relative 1e-12 (the former bound was
    // absolute 1e-12 below 1, which this keeps or tightens).
    verify::source("closed form: SI prefixes, 1 cm = 0.01 m, quantities typed with their units");
    let close = |q: &str, unit: &str, a: f64, b: f64| verify::close(q, unit, a, b, 1e-12);
    close("E = \"200 GPa\"", "Pa", m.materials[0].e, 200e9);
    close(
        "unit weight \"77 kN/m^3\"",
        "N/m³",
        m.materials[0].unit_weight.unwrap(),
        77e3,
    );
    close("A = \"100 cm^2\"", "m²", m.sections[0].area, 100e-4);
    close("I = \"8000 cm^4\"", "m⁴", m.sections[0].inertia, 8000e-8);
    close("depth = \"300 mm\"", "m", m.sections[0].depth.unwrap(), 0.3);
    let n = |id: &str| &m.nodes[m.node_index(id).unwrap()];
    close(
        "x of N2.1: origin \"1 m\" + bay \"6 m\"",
        "m",
        n("N2.1").x,
        7.0,
    );
    close(
        "y of N2.1: origin \"0.5 m\" + story \"4000 mm\"",
        "m",
        n("N2.1").y,
        4.5,
    );
    close("x = \"9 m\"", "m", n("tip").x, 9.0);
    let tip = m
        .supports
        .iter()
        .find(|s| m.nodes[s.node].id == "tip")
        .unwrap();
    verify::same(
        "springs \"2000 kN/m\", \"3 MN/m\", \"500 kN*m/rad\"",
        [
            Restraint::Spring(2e6),
            Restraint::Spring(3e6),
            Restraint::Spring(5e5),
        ],
        tip.dofs,
    );
    let q = &m.load_cases[0];
    verify::same(
        "nodal load \"10 kN\", \"-2000 N\", \"5 kN·m\" (fx, fy, mz)",
        (1e4, -2000.0, 5000.0),
        (q.nodal[0].fx, q.nodal[0].fy, q.nodal[0].mz),
    );
    let kinds: Vec<&MemberLoadKind> = q.member.iter().map(|l| &l.kind).collect();
    verify::same(
        "uniform load \"12 kN/m\" from \"1 m\" to \"5000 mm\"",
        MemberLoadKind::Distributed {
            a: 1.0,
            b: 5.0,
            w_a: 12e3,
            w_b: 12e3,
            direction: LoadDirection::Gravity,
            measure: Measure::AlongMember,
        },
        kinds[0].clone(),
    );
    verify::same(
        "linear load \"2 kN/m\" to \"4 N/mm\" over the 6 m beam",
        MemberLoadKind::Distributed {
            a: 0.0,
            b: 6.0,
            w_a: 2e3,
            w_b: 4e3,
            direction: LoadDirection::LocalY,
            measure: Measure::AlongMember,
        },
        kinds[1].clone(),
    );
    verify::same(
        "point load \"7 kN\" at \"250 cm\"",
        MemberLoadKind::Point {
            a: 2.5,
            p: 7e3,
            direction: LoadDirection::GlobalX,
        },
        kinds[2].clone(),
    );
    verify::same(
        "moment \"3 kN*m\" at \"2 m\"",
        MemberLoadKind::Moment { a: 2.0, m: 3e3 },
        kinds[3].clone(),
    );
    assert_eq!(m.combos.params["psi"], 0.7);
    assert_eq!(
        m.analysis.notional,
        plumbline::model::NotionalLoads::Aisc { coefficient: 0.003 }
    );
    assert_eq!(m.analysis.beta_dns, 0.5);
    assert_eq!(m.analysis.inertia_factor["column"], 0.8);
    close(
        "story level \"4.5 m\"",
        "m",
        m.stories.as_ref().unwrap().levels[0],
        4.5,
    );
}

#[test]
fn bare_numbers_use_the_declared_units() {
    // kip-ft: lengths ft, forces kip, sections in, stress ksi. 1 ft = 0.3048 m, 1 in =
    // 0.0254 m, 1 kip = 4448.2216152605 N (exact definitions, NIST SP 811 App. B).
    let t = ALL_STRINGS
        .replace("E = \"200 GPa\"", "E = 29000")
        .replace("A = \"100 cm^2\"", "A = 15.6")
        .replace("x = \"9 m\"", "x = 30");
    let m = parse_model(&t, "bare.toml").unwrap();
    let ksi = 4_448.221_615_260_5 / (0.0254 * 0.0254);
    verify::source("NIST SP 811 (2008) App. B, exact definitions of ft, in and lbf");
    verify::close(
        "bare E = 29000 under kip-ft (ksi)",
        "Pa",
        m.materials[0].e,
        29000.0 * ksi,
        1e-15,
    );
    verify::close(
        "bare A = 15.6 under kip-ft (in²)",
        "m²",
        m.sections[0].area,
        15.6 * 0.0254 * 0.0254,
        1e-15,
    );
    // Relative to the length, the former absolute 1e-12 m rounded down.
    verify::close(
        "bare x = 30 under kip-ft (ft)",
        "m",
        m.nodes[m.node_index("tip").unwrap()].x,
        30.0 * 0.3048,
        1e-13,
    );
    // Units table: preset with an override reports deflections in mm.
    let t = ALL_STRINGS.replace(
        "units = \"kip-ft\"",
        "units = { preset = \"kip-ft\", deflection = \"mm\" }",
    );
    let m = parse_model(&t, "override.toml").unwrap();
    assert_eq!(
        m.units.label(plumbline::units::Dimension::Displacement),
        "mm"
    );
    assert_eq!(m.units.label(plumbline::units::Dimension::Moment), "kip·ft");
}

#[test]
fn documented_example_parses() {
    let doc =
        std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join("docs/model-file.md"))
            .unwrap();
    let start = doc.find("```toml\n").unwrap() + 8;
    let end = start + doc[start..].find("```").unwrap();
    let m = parse_model(&doc[start..end], "model-file.md").unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(m.members.len(), 15);
    assert_eq!(m.load_cases.len(), 3);
}

#[test]
fn truncated_and_mangled_files_give_errors_not_panics() {
    for name in [
        "workshop-portal.toml",
        "retail-2story.toml",
        "gable-frame.toml",
        "office-3story.toml",
    ] {
        let text = std::fs::read_to_string(
            Path::new(env!("CARGO_MANIFEST_DIR"))
                .join("examples")
                .join(name),
        )
        .unwrap();
        let lines: Vec<&str> = text.lines().collect();
        for k in 0..lines.len() {
            // Every prefix of the file, and the file with line k removed.
            let _ = parse_model(&lines[..k].join("\n"), name);
            let mut cut = lines.clone();
            cut.remove(k);
            let _ = parse_model(&cut.join("\n"), name);
        }
    }
}

#[test]
fn explicit_member_overlapping_generated_columns() {
    // A member from N1.0 to N1.2 lies along columns C1.1 and C1.2.
    let t = format!(
        "{TWO_BAY_THREE_STORY}\n[[member]]\nid = \"long\" # <-\ni = \"N1.0\"\nj = \"N1.2\"\nsection = \"beam\"\nmaterial = \"S355\"\n"
    );
    let msg = error_on_marked_line(&t);
    assert!(msg.contains("overlaps member \"C1.1\" over 4.5 m"), "{msg}");
    // A duplicate of a generated node id points at the explicit node.
    let t = format!("{TWO_BAY_THREE_STORY}\n[[node]]\nid = \"N2.2\" # <-\nx = 1\ny = 1\n");
    assert!(error_on_marked_line(&t).contains("duplicate node id \"N2.2\""));
}

#[test]
fn the_generator_takes_exterior_and_interior_columns_and_hinges() {
    // Issue 20 item 10: the id scheme of docs/model-file.md, column sections by grid line
    // (1 and the last exterior), leaning columns hinged at both ends, and beam ends hinged
    // where they meet a chosen grid line (project requirements, no external source).
    let text = std::fs::read_to_string(
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/frames/leaning-braced.toml"),
    )
    .unwrap();
    let model = parse_model(&text, "leaning-braced.toml").unwrap();
    let member = |id: &str| &model.members[model.member_index(id).expect(id)];
    let section = |id: &str| model.sections[member(id).section].id.as_str();
    for s in 1..=2 {
        assert_eq!(section(&format!("C1.{s}")), "W10x33");
        assert_eq!(section(&format!("C2.{s}")), "W12x53");
        assert_eq!(section(&format!("C3.{s}")), "W12x53");
        assert_eq!(section(&format!("C4.{s}")), "W10x33");
        let c4 = member(&format!("C4.{s}"));
        assert!(c4.release_i && c4.release_j);
        let c2 = member(&format!("C2.{s}"));
        assert!(!c2.release_i && !c2.release_j);
        let b3 = member(&format!("B3.{s}"));
        assert_eq!((b3.release_i, b3.release_j), (false, true));
        let b1 = member(&format!("B1.{s}"));
        assert_eq!((b1.release_i, b1.release_j), (false, false));
    }
    // A grid line that is not there is refused at its value.
    let bad = text.replace("hinged_columns = [4]", "hinged_columns = [5] # <-");
    assert!(
        error_on_marked_line(&bad).contains("expected a grid line number from 1 to 4"),
        "{bad}"
    );
}
