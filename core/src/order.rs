//! Sorting through two shared routines.
//!
//! Every `sort_by` with a closure of its own compiles to a separate copy of the standard
//! library's sort (about 5 KB of wasm each, and the page had a dozen). The core and the app sort
//! through these helpers instead, so the page carries one copy for positions and one for
//! numbers. The sorts are stable, like `slice::sort_by`.

use std::cmp::Ordering;

/// The positions `0..len` in the order `compare` puts them, stable: positions that compare
/// equal keep their order.
pub fn sorted_positions(len: usize, compare: &dyn Fn(usize, usize) -> Ordering) -> Vec<usize> {
    let mut order: Vec<usize> = (0..len).collect();
    sort_positions(&mut order, compare);
    order
}

/// Sorts a list of positions (any subset, any order) by `compare`, stable.
pub fn sort_positions(order: &mut [usize], compare: &dyn Fn(usize, usize) -> Ordering) {
    order.sort_by(|&a, &b| compare(a, b));
}

/// Sorts numbers ascending by `f64::total_cmp` (NaN last, -0 before +0).
pub fn sort_floats(values: &mut [f64]) {
    values.sort_by(f64::total_cmp);
}

/// Sorts `items` by `compare`, stable, through [`sorted_positions`].
pub fn sort_by<T>(items: &mut Vec<T>, compare: &dyn Fn(&T, &T) -> Ordering) {
    let order = sorted_positions(items.len(), &|a, b| compare(&items[a], &items[b]));
    let mut slots: Vec<Option<T>> = items.drain(..).map(Some).collect();
    items.extend(order.into_iter().filter_map(|i| slots[i].take()));
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sort_by_is_stable_and_keeps_every_item() {
        let mut items = vec![(3, 'a'), (1, 'b'), (3, 'c'), (2, 'd'), (1, 'e')];
        sort_by(&mut items, &|x, y| x.0.cmp(&y.0));
        assert_eq!(items, [(1, 'b'), (1, 'e'), (2, 'd'), (3, 'a'), (3, 'c')]);
    }

    #[test]
    fn positions_follow_the_comparison() {
        let values = [0.5_f64, -1.0, 2.0, -1.0];
        let order = sorted_positions(values.len(), &|a, b| values[a].total_cmp(&values[b]));
        assert_eq!(order, [1, 3, 0, 2]);
        let mut subset = vec![2, 0];
        sort_positions(&mut subset, &|a, b| values[a].total_cmp(&values[b]));
        assert_eq!(subset, [0, 2]);
    }

    #[test]
    fn floats_sort_with_nan_last() {
        let mut values = [1.0, f64::NAN, -3.0, 0.0];
        sort_floats(&mut values);
        assert_eq!(&values[..3], &[-3.0, 0.0, 1.0]);
        assert!(values[3].is_nan());
    }
}
