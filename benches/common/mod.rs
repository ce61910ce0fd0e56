//! The invented bench frame shared by the benchmarks (illustrative sections, not a design):
//! `bays` bays of 8 m and `stories` storeys of 4 m, fixed bases, steel columns and beams,
//! dead load (self-weight plus 20 kN/m on every beam), live load 10 kN/m on every beam,
//! and wind of 10 kN at every level from the left (WL) or the right (WR).

/// The model file of the bench frame titled `title`; with `arrange`, its live load is
/// arranged span by span (`arrange = true`).
pub fn frame_text(title: &str, bays: usize, stories: usize, arrange: bool) -> String {
    let list = |n: usize, v: f64| vec![format!("{v}"); n].join(", ");
    let arranged = if arrange { "arrange = true\n" } else { "" };
    format!(
        r#"title = "{title} {bays} x {stories}"
units = "kN-m"
[[material]]
id = "S"
E = "200 GPa"
unit_weight = "77 kN/m^3"
[[section]]
id = "COL"
A = "20000 mm^2"
I = "4.0e8 mm^4"
role = "column"
[[section]]
id = "BM"
A = "10000 mm^2"
I = "5.0e8 mm^4"
role = "beam"
[frame]
bays = [{}]
stories = [{}]
base = "fixed"
material = "S"
columns = ["COL"]
beams = ["BM"]
[[case]]
id = "D"
category = "dead"
self_weight = true
[[case.member_load]]
members = "B*"
kind = "uniform"
direction = "down"
w = 20
[[case]]
id = "L"
category = "live"
{arranged}[[case.member_load]]
members = "B*"
kind = "uniform"
direction = "down"
w = 10
[[case]]
id = "WL"
category = "wind"
alternative = "wind"
[[case.node_load]]
nodes = "N1.*"
fx = 10
[[case]]
id = "WR"
category = "wind"
alternative = "wind"
[[case.node_load]]
nodes = "N{}.*"
fx = -10
"#,
        list(bays, 8.0),
        list(stories, 4.0),
        bays + 1,
    )
}
