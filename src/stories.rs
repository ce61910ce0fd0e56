//! Stories of a planar frame: the levels where beams frame into columns, each story's
//! columns, height and the nodes of its top level.
//!
//! Levels are the elevations of column tops (columns are members with role
//! [`Role::Column`]), or the model's declared levels. Every column must run from one level
//! (or the base) to the next one up: a column that passes a level without a node there, as
//! beside a mezzanine, is rejected with a message rather than guessed. Nodes between levels
//! (a sloped roof's ridge, a column's mid-height node) are not story nodes.

use serde::Serialize;

use crate::model::{Model, Role};

/// Elevations closer than this are one level, m (defined with the model).
pub use crate::model::LEVEL_TOLERANCE;

/// One story of the frame.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Story {
    /// 1 for the lowest story.
    pub number: usize,
    /// Elevation of the story's bottom and top, m.
    pub bottom: f64,
    pub top: f64,
    /// The columns (member indices) of this story.
    pub columns: Vec<usize>,
    /// Nodes at the top level.
    pub top_nodes: Vec<usize>,
    /// Nodes at the bottom level (the base nodes for story 1).
    pub bottom_nodes: Vec<usize>,
}

impl Story {
    /// Story height h, m.
    pub fn height(&self) -> f64 {
        self.top - self.bottom
    }
}

/// Why stories could not be formed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum StoryError {
    #[error("the model has no columns (members with role column), so it has no stories")]
    NoColumns,
    #[error(
        "column {column} runs from elevation {bottom:.3} m to {top:.3} m across the level at \
         {level:.3} m without a node there; add a node at that level or declare the story levels"
    )]
    ColumnSpansLevel {
        column: String,
        bottom: f64,
        top: f64,
        level: f64,
    },
    #[error(
        "column {column} (from elevation {bottom:.3} m to {top:.3} m) lies outside the declared \
         story levels; add its top level to story_levels"
    )]
    ColumnOutsideLevels {
        column: String,
        bottom: f64,
        top: f64,
    },
    #[error("story {number} (from {bottom:.3} m to {top:.3} m) has no column")]
    EmptyStory {
        number: usize,
        bottom: f64,
        top: f64,
    },
}

/// Form the stories of `model`.
pub fn stories(model: &Model) -> Result<Vec<Story>, StoryError> {
    let columns: Vec<usize> = (0..model.members.len())
        .filter(|&m| model.members[m].role == Role::Column)
        .collect();
    if columns.is_empty() {
        return Err(StoryError::NoColumns);
    }
    let ends = |m: usize| {
        let mem = &model.members[m];
        let (a, b) = (model.nodes[mem.i].y, model.nodes[mem.j].y);
        (a.min(b), a.max(b))
    };
    let base = columns
        .iter()
        .map(|&m| ends(m).0)
        .fold(f64::INFINITY, f64::min);
    let levels = match &model.stories {
        Some(decl) => decl.levels.clone(),
        None => {
            let mut tops: Vec<f64> = columns.iter().map(|&m| ends(m).1).collect();
            tops.sort_by(f64::total_cmp);
            tops.dedup_by(|a, b| (*a - *b).abs() < LEVEL_TOLERANCE);
            tops
        }
    };
    // Each column must sit between consecutive levels.
    let mut out: Vec<Story> = Vec::with_capacity(levels.len());
    let at = |y: f64| -> Vec<usize> {
        (0..model.nodes.len())
            .filter(|&n| (model.nodes[n].y - y).abs() < LEVEL_TOLERANCE)
            .collect()
    };
    for (k, &top) in levels.iter().enumerate() {
        let bottom = if k == 0 { base } else { levels[k - 1] };
        out.push(Story {
            number: k + 1,
            bottom,
            top,
            columns: Vec::new(),
            top_nodes: at(top),
            bottom_nodes: at(bottom),
        });
    }
    for &m in &columns {
        let (lo, hi) = ends(m);
        let inside = levels
            .iter()
            .find(|&&y| y > lo + LEVEL_TOLERANCE && y < hi - LEVEL_TOLERANCE)
            .copied();
        if let Some(level) = inside {
            return Err(StoryError::ColumnSpansLevel {
                column: model.members[m].id.clone(),
                bottom: lo,
                top: hi,
                level,
            });
        }
        // The story whose interval contains the column.
        match out
            .iter_mut()
            .find(|s| lo >= s.bottom - LEVEL_TOLERANCE && hi <= s.top + LEVEL_TOLERANCE)
        {
            Some(s) => s.columns.push(m),
            None => {
                return Err(StoryError::ColumnOutsideLevels {
                    column: model.members[m].id.clone(),
                    bottom: lo,
                    top: hi,
                });
            }
        }
    }
    if let Some(s) = out.iter().find(|s| s.columns.is_empty()) {
        return Err(StoryError::EmptyStory {
            number: s.number,
            bottom: s.bottom,
            top: s.top,
        });
    }
    Ok(out)
}

/// The stories a member belongs to for sway amplification: those whose height range it
/// overlaps; for a member that overlaps none (a beam at a level, a rafter above the top
/// level), the stories that meet at the level of its lower end (below it, and above it
/// unless that level is the base).
pub fn member_stories(model: &Model, stories: &[Story], m: usize) -> Vec<usize> {
    let mem = &model.members[m];
    let (a, b) = (model.nodes[mem.i].y, model.nodes[mem.j].y);
    let (lo, hi) = (a.min(b), a.max(b));
    let overlapping: Vec<usize> = stories
        .iter()
        .enumerate()
        .filter(|(_, s)| hi.min(s.top) - lo.max(s.bottom) > LEVEL_TOLERANCE)
        .map(|(k, _)| k)
        .collect();
    if !overlapping.is_empty() {
        return overlapping;
    }
    stories
        .iter()
        .enumerate()
        .filter(|(_, s)| {
            (lo - s.top).abs() < LEVEL_TOLERANCE
                || ((lo - s.bottom).abs() < LEVEL_TOLERANCE && s.number > 1)
        })
        .map(|(k, _)| k)
        .collect()
}
