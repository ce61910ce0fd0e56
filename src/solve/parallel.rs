//! Independent analyses on every core, results in input order.
//!
//! The factored cases of a check are independent once the frame is factored, so they are
//! shared among `std::thread::available_parallelism()` scoped threads that take the next
//! unclaimed item in turn. Each result is handed on in its item's turn: the output order,
//! and so every report, does not depend on the number of threads or on timing.

use std::collections::BTreeMap;
use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::mpsc;

/// `items.iter().map(f).collect()`, computed on every available core. `progress(done,
/// total)` is called on the calling thread after each item is finished.
pub fn map_in_order<T: Sync, R: Send>(
    items: &[T],
    f: impl Fn(&T) -> R + Sync,
    progress: &mut dyn FnMut(usize, usize),
) -> Vec<R> {
    let mut out = Vec::with_capacity(items.len());
    for_each_in_order(items, f, progress, &mut |_, r| out.push(r));
    out
}

/// `items.iter().map(f)`, computed on every available core, each result handed to
/// `consume(index, result)` on the calling thread in input order, as soon as it and every
/// result before it are done: only the results finished ahead of their turn are held, so a
/// caller that folds them (an envelope) never holds them all. `progress(done, total)` is
/// called on the calling thread after each item is finished.
pub fn for_each_in_order<T: Sync, R: Send>(
    items: &[T],
    f: impl Fn(&T) -> R + Sync,
    progress: &mut dyn FnMut(usize, usize),
    consume: &mut dyn FnMut(usize, R),
) {
    let total = items.len();
    let threads = std::thread::available_parallelism()
        .map_or(1, |n| n.get())
        .min(total);
    if threads <= 1 {
        for (k, item) in items.iter().enumerate() {
            let r = f(item);
            progress(k + 1, total);
            consume(k, r);
        }
        return;
    }
    let next = AtomicUsize::new(0);
    let (done_tx, done_rx) = mpsc::channel::<(usize, R)>();
    std::thread::scope(|scope| {
        for _ in 0..threads {
            let done_tx = done_tx.clone();
            let (next, f) = (&next, &f);
            scope.spawn(move || {
                loop {
                    let k = next.fetch_add(1, Ordering::Relaxed);
                    let Some(item) = items.get(k) else { break };
                    // The receiver lives until every item is counted.
                    let _ = done_tx.send((k, f(item)));
                }
            });
        }
        drop(done_tx);
        let mut done = 0;
        let mut ahead: BTreeMap<usize, R> = BTreeMap::new();
        let mut turn = 0;
        while let Ok((k, r)) = done_rx.recv() {
            done += 1;
            progress(done, total);
            ahead.insert(k, r);
            while let Some(r) = ahead.remove(&turn) {
                consume(turn, r);
                turn += 1;
            }
        }
    });
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn results_keep_the_input_order() {
        let items: Vec<usize> = (0..1000).collect();
        let mut calls = Vec::new();
        let out = map_in_order(&items, |&k| k * k, &mut |done, total| {
            calls.push((done, total))
        });
        assert_eq!(out, items.iter().map(|k| k * k).collect::<Vec<_>>());
        // Progress counts every item once, in increasing order (closed form: 1..=n).
        assert_eq!(calls, (1..=1000).map(|d| (d, 1000)).collect::<Vec<_>>());
    }

    #[test]
    fn results_are_consumed_in_input_order() {
        // Items of very unequal cost finish out of order; each is handed on in its turn.
        let items: Vec<u64> = (0..200)
            .map(|k| if k % 7 == 0 { 20_000 } else { 10 })
            .collect();
        let mut seen = Vec::new();
        for_each_in_order(
            &items,
            |&n| (0..n).fold(0u64, |a, b| a.wrapping_add(b * b)),
            &mut |_, _| {},
            &mut |k, r| seen.push((k, r)),
        );
        let expected: Vec<(usize, u64)> = items
            .iter()
            .enumerate()
            .map(|(k, &n)| (k, (0..n).fold(0u64, |a, b| a.wrapping_add(b * b))))
            .collect();
        assert_eq!(seen, expected);
    }
}
