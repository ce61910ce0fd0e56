//! Model file reading: shipped examples, the frame generator, quantity strings and every
//! validation error with its line number.

use plumbline::input::{load_model, parse_model};
use plumbline::model::{LoadDirection, Measure, MemberLoadKind, Restraint, Role};
use std::path::Path;

fn example(name: &str) -> plumbline::model::Model {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("examples").join(name);
    load_model(&path).unwrap_or_else(|e| panic!("{name}: {e}"))
}

#[test]
fn every_example_parses() {
    for name in ["workshop-portal.toml", "retail-2story.toml", "gable-frame.toml", "office-3story.toml"] {
        let m = example(name);
        assert!(!m.load_cases.is_empty(), "{name}");
        assert!(m.combos.table.is_some(), "{name}");
    }
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
    text.lines().position(|l| l.contains(marker)).expect("marker in text") + 1
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
    assert_eq!(m.materials[0].e, 210e9);
    assert!((m.sections[0].area - 0.01).abs() < 1e-15);
    assert!((m.sections[0].inertia - 1e-4).abs() < 1e-18);
    // 78.5 kN/m³ = 78 500 N/m³.
    assert!((m.materials[0].unit_weight.unwrap() - 78_500.0).abs() < 1e-9);
}

// ---------- validation errors, each with its line ----------

#[test]
fn toml_syntax_error() {
    let t = base_with("x = 6\n", "x = = 6 # <-\n");
    error_on_marked_line(&t);
}

#[test]
fn unknown_key() {
    let t = base_with("section = \"s1\"\nmaterial", "sectoin = \"s1\" # <-\nmaterial");
    let msg = error_on_marked_line(&t);
    assert!(msg.contains("sectoin"), "{msg}");
}

#[test]
fn unknown_node_in_member() {
    let t = base_with("j = \"c\"", "j = \"cc\" # <-");
    let msg = error_on_marked_line(&t);
    assert!(msg.contains("unknown node \"cc\"") && msg.contains("expected one of"), "{msg}");
}

#[test]
fn unknown_section_and_material() {
    let t = base_with("section = \"s1\"\nmaterial = \"steel\"\n\n[[support]]", "section = \"s2\" # <-\nmaterial = \"steel\"\n\n[[support]]");
    assert!(error_on_marked_line(&t).contains("unknown section \"s2\""));
    let t = base_with("material = \"steel\"\n\n[[support]]", "material = \"iron\" # <-\n\n[[support]]");
    assert!(error_on_marked_line(&t).contains("unknown material \"iron\""));
}

#[test]
fn duplicate_ids() {
    let t = base_with("id = \"c\"", "id = \"b\" # <-");
    let msg = error_on_marked_line(&t);
    assert!(msg.contains("duplicate node id \"b\"") && msg.contains("line 19"), "{msg}");
    let t = base_with("id = \"m2\"", "id = \"m1\" # <-");
    assert!(error_on_marked_line(&t).contains("duplicate member id"));
    let t = format!("{BASE}\n[[section]]\nid = \"s1\" # <-\nA = 1\nI = 1\n");
    assert!(error_on_marked_line(&t).contains("duplicate section id"));
    let t = format!("{BASE}\n[[case]]\nid = \"D\"\ncategory = \"dead\"\n[[case]]\nid = \"D\" # <-\ncategory = \"live\"\n");
    assert!(error_on_marked_line(&t).contains("duplicate load case id"));
}

#[test]
fn zero_length_member() {
    let t = format!("{BASE}\n[[member]]\nid = \"m3\" # <-\ni = \"c\"\nj = \"c\"\nsection = \"s1\"\nmaterial = \"steel\"\n");
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
    let point = |at: &str| base_with_case(&format!(
        "[[case.member_load]]\nmembers = \"m2\"\nkind = \"point\"\ndirection = \"gravity\"\np = 10\nat = {at} # <-\n"
    ));
    let msg = error_on_marked_line(&point("6.5"));
    assert!(msg.contains("expected 0 ≤ at ≤ L = 6 m"), "{msg}");
    error_on_marked_line(&point("-0.1"));
    error_on_marked_line(&point("\"1.2L\""));
    let part = |from: &str, to: &str| base_with_case(&format!(
        "[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\"\ndirection = \"gravity\"\nw = 5\n{from}\n{to}\n"
    ));
    error_on_marked_line(&part("from = -1 # <-", "to = 3"));
    error_on_marked_line(&part("from = 1", "to = 7 # <-"));
    let msg = error_on_marked_line(&part("from = 4", "to = 3 # <-"));
    assert!(msg.contains("expected from < to"), "{msg}");
    error_on_marked_line(&part("from = 3", "to = 3 # <-"));
}

#[test]
fn non_positive_stiffness() {
    assert!(error_on_marked_line(&base_with("E = \"210 GPa\"", "E = 0 # <-")).contains("expected a positive value"));
    error_on_marked_line(&base_with("A = 10000", "A = -5 # <-"));
    error_on_marked_line(&base_with("I = 1e8", "I = 0.0 # <-"));
    error_on_marked_line(&base_with("unit_weight = 78.5", "unit_weight = -1 # <-"));
    let t = base_with("type = \"fixed\"", "type = \"pinned\"\nkr = -200 # <-");
    error_on_marked_line(&t);
}

#[test]
fn nan_and_infinite_values() {
    error_on_marked_line(&base_with("x = 6", "x = nan # <-"));
    error_on_marked_line(&base_with("y = 4\n\n[[node]]\nid = \"c\"", "y = inf # <-\n\n[[node]]\nid = \"c\""));
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
    let t = base_with_case("[[case.member_load]]\nmembers = \"m9\" # <-\nkind = \"uniform\"\ndirection = \"gravity\"\nw = 1\n");
    assert!(error_on_marked_line(&t).contains("unknown member \"m9\""));
    let t = base_with_case("[[case.node_load]]\nnodes = [\"b\", \"q\"] # <-\nfx = 1\n");
    assert!(error_on_marked_line(&t).contains("unknown node \"q\""));
    let t = base_with_case("[[case.member_load]]\nmembers = \"B*.9\" # <-\nkind = \"uniform\"\ndirection = \"gravity\"\nw = 1\n");
    assert!(error_on_marked_line(&t).contains("pattern \"B*.9\" matches no member"));
}

#[test]
fn wrong_dimension_says_what_was_expected() {
    let t = base_with_case("[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\"\ndirection = \"gravity\"\nw = \"12 kN*m\" # <-\n");
    let msg = error_on_marked_line(&t);
    assert!(msg.contains("expected a line load (force/length), got kN*m"), "{msg}");
    let t = base_with("I = 1e8", "I = \"8000 cm^3\" # <-");
    assert!(error_on_marked_line(&t).contains("expected a second moment of area (length^4), got cm^3"));
}

#[test]
fn unknown_unit_and_unit_system() {
    let t = base_with("E = \"210 GPa\"", "E = \"210 GPascal\" # <-");
    assert!(error_on_marked_line(&t).contains("unknown unit \"GPascal\""));
    let t = base_with("units = \"kN-m\"", "units = \"metric\" # <-");
    assert!(error_on_marked_line(&t).contains("expected one of kN-m, kip-ft, kip-in, N-mm"));
    let t = base_with("units = \"kN-m\"", "units = { preset = \"kN-m\", deflection = \"kN\" } # <-");
    assert!(error_on_marked_line(&t).contains("expected a displacement (length), got kN"));
    let t = base_with("units = \"kN-m\"", "# <- missing units point at the file start");
    assert!(error_on_marked_line(&t).contains("missing units"));
}

#[test]
fn unknown_choices() {
    let t = format!("{BASE}\n[[case]]\nid = \"X\"\ncategory = \"imposed\" # <-\n");
    let msg = error_on_marked_line(&t);
    assert!(msg.contains("dead, live, roof-live, snow, rain, wind, seismic, temperature"), "{msg}");
    error_on_marked_line(&base_with("type = \"fixed\"", "type = \"clamped\" # <-"));
    let t = base_with("material = \"steel\"\n\n[[member]]", "material = \"steel\"\nhinge = \"middle\" # <-\n\n[[member]]");
    error_on_marked_line(&t);
    let t = base_with_case("[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\"\ndirection = \"down\" # <-\nw = 1\n");
    error_on_marked_line(&t);
    let t = base_with_case("[[case.member_load]]\nmembers = \"m2\"\nkind = \"triangle\" # <-\ndirection = \"gravity\"\nw = 1\n");
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
    let t = base_with_case("[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\"\ndirection = \"gravity\"\nw = 1\np = 3 # <-\n");
    assert!(error_on_marked_line(&t).contains("`p` does not apply to a uniform load"));
    let t = base_with_case("[[case.member_load]]\nmembers = \"m2\"\nkind = \"point\" # <-\ndirection = \"gravity\"\np = 3\n");
    assert!(error_on_marked_line(&t).contains("needs `at`"));
    let t = base_with_case("[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\" # <-\nw = 3\n");
    assert!(error_on_marked_line(&t).contains("needs `direction`"));
    let t = base_with_case("[[case.member_load]]\nmembers = \"m2\"\nkind = \"uniform\"\ndirection = \"local-y\"\nmeasure = \"projected\" # <-\nw = 3\n");
    assert!(error_on_marked_line(&t).contains("global direction"));
    let t = base_with_case("[[case.node_load]]\nnodes = \"b\" # <-\n");
    assert!(error_on_marked_line(&t).contains("at least one of fx, fy, mz"));
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
    let frame = |body: &str| format!(
        "units = \"kN-m\"\n[[material]]\nid = \"st\"\nE = 210000\n[[section]]\nid = \"c\"\nA = 1e4\nI = 1e8\n\
         [frame]\n{body}\n"
    );
    let t = frame("bays = [6, 6]\nstories = [4, 3, 3]\nbase = \"fixed\"\nmaterial = \"st\"\ncolumns = [\"c\", \"c\"] # <-\nbeams = [\"c\"]");
    assert!(error_on_marked_line(&t).contains("expected 1 section (every story) or 3"));
    let t = frame("bays = [6, 0] # <-\nstories = [4]\nbase = \"fixed\"\nmaterial = \"st\"\ncolumns = [\"c\"]\nbeams = [\"c\"]");
    error_on_marked_line(&t);
    let t = frame("bays = [6]\nstories = [4]\nbase = \"sliding\" # <-\nmaterial = \"st\"\ncolumns = [\"c\"]\nbeams = [\"c\"]");
    error_on_marked_line(&t);
    let t = frame("bays = [6]\nstories = [4]\nbase = \"fixed\"\nmaterial = \"st\"\ncolumns = [\"W8\"] # <-\nbeams = [\"c\"]");
    assert!(error_on_marked_line(&t).contains("unknown section \"W8\""));
}
