//! Independent analyses on every core, results in input order.
//!
//! The factored cases of a check are independent once the frame is factored, so they are
//! shared among `std::thread::available_parallelism()` scoped threads that take the next
//! unclaimed item in turn. Each result is stored at its item's index: the output order,
//! and so every report, does not depend on the number of threads or on timing.

use std::sync::Mutex;
use std::sync::atomic::{AtomicUsize, Ordering};

/// `items.iter().map(f).collect()`, computed on every available core.
pub fn map_in_order<T: Sync, R: Send>(items: &[T], f: impl Fn(&T) -> R + Sync) -> Vec<R> {
    let threads = std::thread::available_parallelism()
        .map_or(1, |n| n.get())
        .min(items.len());
    if threads <= 1 {
        return items.iter().map(f).collect();
    }
    let next = AtomicUsize::new(0);
    let slots: Vec<Mutex<Option<R>>> = items.iter().map(|_| Mutex::new(None)).collect();
    std::thread::scope(|scope| {
        for _ in 0..threads {
            scope.spawn(|| {
                loop {
                    let k = next.fetch_add(1, Ordering::Relaxed);
                    let Some(item) = items.get(k) else { break };
                    let r = f(item);
                    *slots[k].lock().unwrap_or_else(|p| p.into_inner()) = Some(r);
                }
            });
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
        let out = map_in_order(&items, |&k| k * k);
        assert_eq!(out, items.iter().map(|k| k * k).collect::<Vec<_>>());
    }
}
