//! Neutrality solves over a temperature grid, sharing the temperature-independent preparation.

use std::sync::Arc;

use crate::materials::{DopantDensity, Material};
use crate::neutrality::{CarrierError, Equilibrium, Problem, SolveOptions};

/// Most points a grid may have (a chart has no use for more; it keeps a typo
/// from asking for billions of solves).
pub const MAX_GRID_POINTS: usize = 100_000;

/// Solves neutrality at every temperature in `temperatures_k`.
///
/// The material, doping and options are validated once; each point then gets
/// its own result, so one bad temperature (e.g. outside a fit's range) does
/// not spoil the rest. Each solve starts from the Fermi level (E_F - E_V in
/// eV) extrapolated from the two previous successful points, which saves
/// iterations on smooth grids; the solver is bracketed, so a poor start
/// costs time, never correctness.
///
/// # Errors
/// Every entry is the error [`crate::neutrality::solve`] would give for that
/// temperature; a material, doping or option error repeats in every entry.
pub fn temperature_sweep(
    material: &Material,
    temperatures_k: &[f64],
    doping: &[DopantDensity],
    options: &SolveOptions,
) -> Vec<Result<Equilibrium, CarrierError>> {
    let problem = match Problem::new(material, doping, options) {
        Ok(p) => p,
        Err(e) => return temperatures_k.iter().map(|_| Err(e.clone())).collect(),
    };
    // Every point names the same models: built once, shared.
    let models = problem.models_used();
    // The last two successful points (T, E_F - E_V): each solve starts from
    // their linear extrapolation, which on a chart-dense grid is within a
    // fraction of a meV of the answer.
    let mut previous: [Option<(f64, f64)>; 2] = [None, None];
    temperatures_k
        .iter()
        .map(|&t| {
            let hint = match previous {
                [Some((t0, e0)), Some((t1, e1))] if t1 != t0 => {
                    Some(e1 + (e1 - e0) * (t - t1) / (t1 - t0))
                }
                [_, Some((_, e1))] => Some(e1),
                _ => None,
            };
            let r = problem.solve_at(t, hint, Arc::clone(&models));
            match &r {
                Ok(e) => previous = [previous[1], Some((t, e.fermi_minus_valence_ev))],
                Err(_) => previous = [None, None],
            }
            r
        })
        .collect()
}

/// `points` temperatures evenly spaced from `start_k` to `stop_k` inclusive.
///
/// # Errors
/// [`CarrierError::InvalidGrid`] when a bound is not finite and > 0, or
/// `points` is 0 or above [`MAX_GRID_POINTS`], or `points` is 1 with
/// `start_k != stop_k`. `start_k > stop_k` is allowed (a descending grid).
pub fn linear_grid_k(start_k: f64, stop_k: f64, points: usize) -> Result<Vec<f64>, CarrierError> {
    for (field, v) in [("start_k", start_k), ("stop_k", stop_k)] {
        if !(v.is_finite() && v > 0.0) {
            return Err(CarrierError::InvalidGrid {
                field,
                value: v,
                allowed: "a finite value > 0 K",
            });
        }
    }
    if points == 0 || points > MAX_GRID_POINTS || (points == 1 && start_k != stop_k) {
        return Err(CarrierError::InvalidGrid {
            field: "points",
            value: points as f64,
            allowed: "2 to 100000 points (1 only when start equals stop)",
        });
    }
    if points == 1 {
        return Ok(vec![start_k]);
    }
    let step = (stop_k - start_k) / (points - 1) as f64;
    Ok((0..points)
        .map(|i| {
            if i + 1 == points {
                stop_k
            } else {
                start_k + step * i as f64
            }
        })
        .collect())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn grid_includes_both_ends() {
        let g = linear_grid_k(10.0, 1000.0, 200).unwrap();
        assert_eq!((g.len(), g[0], g[199]), (200, 10.0, 1000.0));
        assert!(linear_grid_k(10.0, 1000.0, 0).is_err());
        assert!(linear_grid_k(-1.0, 1000.0, 5).is_err());
    }
}
