//! Node orderings that keep the stiffness matrix profile small.
//!
//! The direct stiffness method numbers degrees of freedom node by node, so the envelope
//! (profile) of the assembled matrix is governed by how the *nodes* are numbered. This
//! module works on the node graph (an edge wherever a member joins two nodes) and returns
//! a node order; [`expand_to_dofs`] turns it into a DOF order when every node carries the
//! same number of DOFs.
//!
//! Reverse Cuthill–McKee with a pseudo-peripheral start node follows A. George and
//! J. W.-H. Liu, *Computer Solution of Large Sparse Positive Definite Systems*,
//! Prentice-Hall (1981), ch. 4 (the RCM algorithm and the pseudo-peripheral node finder
//! of Gibbs, Poole and Stockmeyer as modified there) — from memory.
//!
//! Conventions: `order[k]` is the original node placed k-th; `inverse(order)[v]` is the new
//! position of original node `v`. Adjacency lists should be symmetric (`w ∈ adj[v]` ⇔
//! `v ∈ adj[w]`); self-loops and repeated neighbours are harmless. Neighbour indices
//! outside `0..n` are a programming error (checked by `debug_assert`, skipped otherwise).

use std::collections::VecDeque;

/// Reverse Cuthill–McKee ordering of a graph given by adjacency lists.
///
/// Returns `order` with `order[k]` = original node placed k-th; it is always a permutation
/// of `0..adjacency.len()`. Each connected component is numbered from a pseudo-peripheral
/// node found by starting at a node of minimum degree in that component (George & Liu
/// 1981, §4.3, from memory); within a level, the unnumbered neighbours of each node are
/// taken in increasing degree. The complete Cuthill–McKee sequence is then reversed, which
/// never enlarges the envelope and usually shrinks it (George & Liu 1981, §4.3, from memory).
pub fn rcm(adjacency: &[Vec<usize>]) -> Vec<usize> {
    let n: usize = adjacency.len();
    let degree: Vec<usize> = adjacency.iter().map(|nbrs| nbrs.len()).collect();

    // Nodes in increasing degree: the first unnumbered one seeds the next component.
    let mut by_degree: Vec<usize> = (0..n).collect();
    by_degree.sort_by_key(|&v| (degree[v], v));

    let mut numbered: Vec<bool> = vec![false; n];
    let mut order: Vec<usize> = Vec::with_capacity(n);
    let mut scratch: LevelScratch = LevelScratch::new(n);
    let mut children: Vec<usize> = Vec::new();

    for &seed in &by_degree {
        if numbered[seed] {
            continue;
        }
        let start: usize = pseudo_peripheral_node(adjacency, &degree, seed, &mut scratch);

        // Cuthill–McKee breadth-first numbering of this component.
        let first: usize = order.len();
        numbered[start] = true;
        order.push(start);
        let mut head: usize = first;
        while head < order.len() {
            let v: usize = order[head];
            head += 1;
            children.clear();
            for &w in neighbours(adjacency, v) {
                if !numbered[w] {
                    numbered[w] = true;
                    children.push(w);
                }
            }
            children.sort_by_key(|&w| (degree[w], w));
            order.extend_from_slice(&children);
        }
    }
    order.reverse();
    order
}

/// Inverse of a permutation: `inverse(order)[order[k]] == k`.
///
/// `order` must be a permutation of `0..order.len()` (checked by `debug_assert`).
pub fn inverse(order: &[usize]) -> Vec<usize> {
    debug_assert!(is_permutation(order), "inverse: not a permutation");
    let mut position: Vec<usize> = vec![0; order.len()];
    for (k, &v) in order.iter().enumerate() {
        position[v] = k;
    }
    position
}

/// True when `order` holds each of `0..order.len()` exactly once.
pub fn is_permutation(order: &[usize]) -> bool {
    let mut seen: Vec<bool> = vec![false; order.len()];
    for &v in order {
        if v >= order.len() || seen[v] {
            return false;
        }
        seen[v] = true;
    }
    true
}

/// Bandwidth of the graph under the numbering `order`: the largest |pos(v) − pos(w)| over
/// all edges v–w (0 for a graph without edges).
pub fn bandwidth(adjacency: &[Vec<usize>], order: &[usize]) -> usize {
    row_widths(adjacency, order).into_iter().max().unwrap_or(0)
}

/// Profile (envelope size) of the graph under the numbering `order`: Σ over rows of the
/// distance from the first neighbour position to the diagonal, i.e. the number of
/// off-diagonal entries a node-level skyline stores (George & Liu 1981, §4.1, from memory).
pub fn profile(adjacency: &[Vec<usize>], order: &[usize]) -> usize {
    row_widths(adjacency, order).into_iter().sum()
}

/// Expand a node order to a DOF order for `dofs_per_node` DOFs per node, numbered node by
/// node: DOF `d` of node `order[k]` (original DOF `order[k]·dofs_per_node + d`) is placed at
/// `k·dofs_per_node + d`. The result is again "original index placed k-th".
pub fn expand_to_dofs(order: &[usize], dofs_per_node: usize) -> Vec<usize> {
    order
        .iter()
        .flat_map(|&v| (0..dofs_per_node).map(move |d| v * dofs_per_node + d))
        .collect()
}

/// For each new row k (node `order[k]`): k − (smallest new position among the node and its
/// neighbours). Shared by [`bandwidth`] and [`profile`].
fn row_widths(adjacency: &[Vec<usize>], order: &[usize]) -> Vec<usize> {
    let position: Vec<usize> = inverse(order);
    order
        .iter()
        .enumerate()
        .map(|(k, &v)| {
            let first: usize = neighbours(adjacency, v)
                .map(|&w| position[w])
                .fold(k, usize::min);
            k - first
        })
        .collect()
}

/// Neighbours of `v` that are valid node indices (out-of-range entries are skipped).
fn neighbours(adjacency: &[Vec<usize>], v: usize) -> impl Iterator<Item = &usize> {
    let n: usize = adjacency.len();
    adjacency[v].iter().filter(move |&&w| {
        debug_assert!(
            w < n,
            "adjacency[{v}] names node {w}, but there are {n} nodes"
        );
        w < n
    })
}

/// Reusable buffers for rooted level structures, so repeated breadth-first searches over
/// one component cost O(component) each rather than O(n).
struct LevelScratch {
    /// Generation stamp per node; equal to `generation` when visited in the current search.
    stamp: Vec<u32>,
    generation: u32,
    queue: VecDeque<usize>,
    level: Vec<usize>,
}

impl LevelScratch {
    fn new(n: usize) -> LevelScratch {
        LevelScratch {
            stamp: vec![0; n],
            generation: 0,
            queue: VecDeque::new(),
            level: vec![0; n],
        }
    }
}

/// Rooted level structure at `root`: returns (eccentricity, the nodes of the last level).
fn last_level(adjacency: &[Vec<usize>], root: usize, s: &mut LevelScratch) -> (usize, Vec<usize>) {
    s.generation = s.generation.wrapping_add(1);
    if s.generation == 0 {
        s.stamp.iter_mut().for_each(|x| *x = 0);
        s.generation = 1;
    }
    let generation: u32 = s.generation;
    s.queue.clear();
    s.stamp[root] = generation;
    s.level[root] = 0;
    s.queue.push_back(root);
    let mut depth: usize = 0;
    let mut deepest: Vec<usize> = vec![root];
    while let Some(v) = s.queue.pop_front() {
        let lv: usize = s.level[v];
        if lv > depth {
            depth = lv;
            deepest.clear();
        }
        if lv == depth && v != root {
            deepest.push(v);
        }
        for &w in neighbours(adjacency, v) {
            if s.stamp[w] != generation {
                s.stamp[w] = generation;
                s.level[w] = lv + 1;
                s.queue.push_back(w);
            }
        }
    }
    (depth, deepest)
}

/// Pseudo-peripheral node of the component holding `seed` (George & Liu 1981, §4.3.2,
/// from memory): build the level structure at the current root, move to a minimum-degree
/// node of its last level, and repeat while the eccentricity grows.
fn pseudo_peripheral_node(
    adjacency: &[Vec<usize>],
    degree: &[usize],
    seed: usize,
    scratch: &mut LevelScratch,
) -> usize {
    let mut root: usize = seed;
    let (mut eccentricity, mut last) = last_level(adjacency, root, scratch);
    loop {
        let Some(&candidate) = last.iter().min_by_key(|&&w| (degree[w], w)) else {
            return root;
        };
        let (e, l) = last_level(adjacency, candidate, scratch);
        if e > eccentricity {
            root = candidate;
            eccentricity = e;
            last = l;
        } else {
            return root;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::solve::test_rng::Lcg;

    /// Adjacency of a `width`×`height` grid (frame: beams along x, columns along y), with node
    /// (x, y) given the label `label[y·width + x]`.
    fn grid(width: usize, height: usize, label: &[usize]) -> Vec<Vec<usize>> {
        let mut adj: Vec<Vec<usize>> = vec![Vec::new(); width * height];
        let mut link = |a: usize, b: usize| {
            adj[label[a]].push(label[b]);
            adj[label[b]].push(label[a]);
        };
        for y in 0..height {
            for x in 0..width {
                let here: usize = y * width + x;
                if x + 1 < width {
                    link(here, here + 1);
                }
                if y + 1 < height {
                    link(here, here + width);
                }
            }
        }
        adj
    }

    fn identity(n: usize) -> Vec<usize> {
        (0..n).collect()
    }

    #[test]
    fn rcm_returns_a_permutation_for_random_graphs() {
        let mut rng: Lcg = Lcg(7);
        for &n in &[0usize, 1, 2, 5, 40, 200] {
            let mut adj: Vec<Vec<usize>> = vec![Vec::new(); n];
            for _ in 0..(2 * n) {
                let a: usize = rng.below(n);
                let b: usize = rng.below(n);
                adj[a].push(b);
                adj[b].push(a);
            }
            let order: Vec<usize> = rcm(&adj);
            assert_eq!(order.len(), n);
            assert!(is_permutation(&order), "n = {n}");
        }
    }

    #[test]
    fn inverse_undoes_the_order() {
        let order: Vec<usize> = Lcg(3).permutation(50);
        let position: Vec<usize> = inverse(&order);
        for (k, &v) in order.iter().enumerate() {
            assert_eq!(position[v], k);
        }
        assert!(!is_permutation(&[0, 0, 1]));
        assert!(!is_permutation(&[0, 3, 1]));
    }

    /// A 10×30 frame grid numbered at random has a large bandwidth; RCM must bring it down to
    /// at most min(width, height) + 1 = 11. Bound: numbering by anti-diagonals (the level sets
    /// from a corner) gives bandwidth ≤ the longest diagonal + 1 (closed form: the neighbours
    /// of a node in level d lie in levels d ± 1, at most one level length away).
    #[test]
    fn rcm_shrinks_a_randomly_numbered_grid() {
        let (width, height) = (10usize, 30usize);
        let label: Vec<usize> = Lcg(11).permutation(width * height);
        let adj: Vec<Vec<usize>> = grid(width, height, &label);
        let before: usize = bandwidth(&adj, &identity(width * height));
        let order: Vec<usize> = rcm(&adj);
        let after: usize = bandwidth(&adj, &order);
        assert!(
            before > 100,
            "random numbering should be poor, got {before}"
        );
        assert!(
            after <= width.min(height) + 1,
            "bandwidth after RCM {after}"
        );
        assert!(profile(&adj, &order) < profile(&adj, &identity(width * height)) / 5);
    }

    /// Same grid, the other way up: the bound must not depend on which side is longer.
    #[test]
    fn rcm_grid_bound_holds_for_wide_grid() {
        let (width, height) = (30usize, 10usize);
        let label: Vec<usize> = Lcg(12).permutation(width * height);
        let adj: Vec<Vec<usize>> = grid(width, height, &label);
        assert!(bandwidth(&adj, &rcm(&adj)) <= width.min(height) + 1);
    }

    /// A path graph numbered at random: RCM starts at an end and gives bandwidth 1, profile
    /// n − 1 (closed form: each node after the first couples only to its predecessor).
    #[test]
    fn rcm_on_a_path_is_optimal() {
        let n: usize = 60;
        let label: Vec<usize> = Lcg(5).permutation(n);
        let mut adj: Vec<Vec<usize>> = vec![Vec::new(); n];
        for k in 0..n - 1 {
            adj[label[k]].push(label[k + 1]);
            adj[label[k + 1]].push(label[k]);
        }
        let order: Vec<usize> = rcm(&adj);
        assert_eq!(bandwidth(&adj, &order), 1);
        assert_eq!(profile(&adj, &order), n - 1);
    }

    /// Two grids, a path and two isolated nodes in one graph: every node appears once, each
    /// component occupies a contiguous run, and each run is as narrow as for the component
    /// alone.
    #[test]
    fn rcm_handles_disconnected_graphs() {
        let mut adj: Vec<Vec<usize>> = Vec::new();
        let mut component_of: Vec<usize> = Vec::new();
        let mut add_component = |part: Vec<Vec<usize>>, id: usize| {
            let offset: usize = adj.len();
            for nbrs in part {
                adj.push(nbrs.into_iter().map(|w| w + offset).collect());
                component_of.push(id);
            }
        };
        add_component(grid(4, 6, &Lcg(1).permutation(24)), 0);
        add_component(vec![Vec::new()], 1);
        add_component(grid(5, 3, &Lcg(2).permutation(15)), 2);
        add_component(vec![vec![1], vec![0, 2], vec![1]], 3);
        add_component(vec![Vec::new()], 4);

        let order: Vec<usize> = rcm(&adj);
        assert!(is_permutation(&order));
        let mut runs: Vec<usize> = Vec::new();
        for &v in &order {
            if runs.last() != Some(&component_of[v]) {
                runs.push(component_of[v]);
            }
        }
        assert_eq!(runs.len(), 5, "components interleaved: {runs:?}");
        assert!(bandwidth(&adj, &order) <= 5); // min(4, 6) + 1 for the larger grid
    }

    #[test]
    fn expand_to_dofs_numbers_node_by_node() {
        assert_eq!(
            expand_to_dofs(&[2, 0, 1], 3),
            vec![6, 7, 8, 0, 1, 2, 3, 4, 5]
        );
        assert!(expand_to_dofs(&[], 3).is_empty());
    }

    #[test]
    fn bandwidth_and_profile_of_a_triangle() {
        // Triangle 0–1–2: rows have widths 0, 1, 2 (closed form).
        let adj: Vec<Vec<usize>> = vec![vec![1, 2], vec![0, 2], vec![0, 1]];
        assert_eq!(bandwidth(&adj, &identity(3)), 2);
        assert_eq!(profile(&adj, &identity(3)), 3);
        assert_eq!(bandwidth(&[], &[]), 0);
    }
}
