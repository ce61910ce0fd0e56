//! Independent analyses on every core, results in input order.
//!
//! The factored cases of a check are independent once the frame is factored, so they are
//! shared among `std::thread::available_parallelism()` scoped threads that take the next
//! unclaimed item in turn. Each result is stored at its item's index: the output order,
//! and so every report, does not depend on the number of threads or on timing.

use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::{Mutex, mpsc};

/// `items.iter().map(f).collect()`, computed on every available core. `progress(done,
/// total)` is called on the calling thread after each item is finished.
pub fn map_in_order<T: Sync, R: Send>(
    items: &[T],
    f: impl Fn(&T) -> R + Sync,
    progress: &mut dyn FnMut(usize, usize),
) -> Vec<R> {
    let total = items.len();
    let threads = std::thread::available_parallelism()
        .map_or(1, |n| n.get())
        .min(total);
    if threads <= 1 {
        return items
            .iter()
            .enumerate()
            .map(|(k, item)| {
                let r = f(item);
                progress(k + 1, total);
                r
            })
            .collect();
    }
    let next = AtomicUsize::new(0);
    let slots: Vec<Mutex<Option<R>>> = items.iter().map(|_| Mutex::new(None)).collect();
    let (done_tx, done_rx) = mpsc::channel::<()>();
    std::thread::scope(|scope| {
        for _ in 0..threads {
            let done_tx = done_tx.clone();
            let (next, slots, f) = (&next, &slots, &f);
            scope.spawn(move || {
                loop {
                    let k = next.fetch_add(1, Ordering::Relaxed);
                    let Some(item) = items.get(k) else { break };
                    let r = f(item);
                    *slots[k].lock().unwrap_or_else(|p| p.into_inner()) = Some(r);
                    // The receiver lives until every item is counted.
                    let _ = done_tx.send(());
                }
            });
        }
        drop(done_tx);
        let mut done = 0;
        while done_rx.recv().is_ok() {
            done += 1;
            progress(done, total);
        }
    });
    slots
        .into_iter()
        .map(|s| {
            s.into_inner()
                .unwrap_or_else(|p| p.into_inner())
                .expect("every item is computed")
        })
        .collect()
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
}
