//! Parameters of `measure`: fuzzy distance and depth sets, directional and topology choices.
//! The defaults equal the shipped `config/measure.toml`.

use super::SpatialError;
use super::landscape::{Aggregate, LandscapeMode};
use serde::{Deserialize, Serialize};
use std::path::Path;

/// A trapezoidal fuzzy set over millimetres: 0 below `a`, rising to 1 at `b`, 1 until `c`,
/// falling to 0 at `d`. Infinite ends are allowed (a shoulder).
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct Trapezoid {
    /// Start of the rise.
    pub a: f64,
    /// End of the rise.
    pub b: f64,
    /// Start of the fall.
    pub c: f64,
    /// End of the fall.
    pub d: f64,
}

impl Trapezoid {
    /// Degree of membership of `x`.
    pub fn degree(&self, x: f64) -> f64 {
        if x.is_nan() || x < self.a || x > self.d {
            return 0.0;
        }
        if x < self.b {
            return if self.b > self.a {
                (x - self.a) / (self.b - self.a)
            } else {
                1.0
            };
        }
        if x <= self.c {
            return 1.0;
        }
        if self.d > self.c {
            (self.d - x) / (self.d - self.c)
        } else {
            1.0
        }
    }

    /// A decreasing shoulder: 1 up to `full`, 0 from `zero` on.
    pub fn falling(full: f64, zero: f64) -> Self {
        Trapezoid {
            a: f64::NEG_INFINITY,
            b: f64::NEG_INFINITY,
            c: full,
            d: zero,
        }
    }

    /// An increasing shoulder: 0 up to `zero`, 1 from `full` on.
    pub fn rising(zero: f64, full: f64) -> Self {
        Trapezoid {
            a: zero,
            b: full,
            c: f64::INFINITY,
            d: f64::INFINITY,
        }
    }
}

/// `near`: 1 while the minimum distance is at most `full_until_mm`, 0 from `zero_from_mm`.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct NearParams {
    /// Distance (mm) up to which `near` is 1.
    pub full_until_mm: f64,
    /// Distance (mm) from which `near` is 0.
    pub zero_from_mm: f64,
}

/// `far`: 0 while the minimum distance is at most `zero_until_mm`, 1 from `full_from_mm`.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FarParams {
    /// Distance (mm) up to which `far` is 0.
    pub zero_until_mm: f64,
    /// Distance (mm) from which `far` is 1.
    pub full_from_mm: f64,
}

/// `peripheral_in` falls and `deep_in` rises with `depth_mm` between the two bounds.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DepthParams {
    /// Depth (mm) up to which `peripheral_in` is 1 and `deep_in` 0.
    pub peripheral_until_mm: f64,
    /// Depth (mm) from which `deep_in` is 1 and `peripheral_in` 0.
    pub deep_from_mm: f64,
}

/// Directional relation choices.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DirectionalParams {
    /// How the target's degrees are combined.
    pub aggregate: Aggregate,
    /// Exact or propagated landscape.
    pub landscape: LandscapeMode,
    /// Largest number of propagation cells of one fast landscape; a larger box is coarsened
    /// by the smallest integer factor that fits (docs/spatial.md states the error).
    pub max_landscape_cells: usize,
}

/// Topology choices.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TopologyParams {
    /// 6 or 26.
    pub adjacency: u32,
}

/// Every parameter of `measure`.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MeasureConfig {
    /// Fuzzy `near`.
    pub near: NearParams,
    /// Fuzzy `far`.
    pub far: FarParams,
    /// Fuzzy depth.
    pub depth: DepthParams,
    /// Directional relations.
    pub directional: DirectionalParams,
    /// RCC-8.
    pub topology: TopologyParams,
}

impl Default for MeasureConfig {
    fn default() -> Self {
        MeasureConfig {
            near: NearParams {
                full_until_mm: 5.0,
                zero_from_mm: 20.0,
            },
            far: FarParams {
                zero_until_mm: 20.0,
                full_from_mm: 60.0,
            },
            depth: DepthParams {
                peripheral_until_mm: 5.0,
                deep_from_mm: 15.0,
            },
            directional: DirectionalParams {
                aggregate: Aggregate::Mean,
                landscape: LandscapeMode::Fast,
                max_landscape_cells: 1 << 21,
            },
            topology: TopologyParams { adjacency: 26 },
        }
    }
}

impl MeasureConfig {
    /// Reads a TOML file; missing tables or keys are errors that name the file.
    pub fn from_file(path: &Path) -> Result<Self, SpatialError> {
        let text = std::fs::read_to_string(path).map_err(|e| SpatialError::Config {
            file: path.display().to_string(),
            message: format!("cannot read: {e}"),
        })?;
        let c: MeasureConfig = toml::from_str(&text).map_err(|e| SpatialError::Config {
            file: path.display().to_string(),
            message: format!("{e}(see config/measure.toml for every key)"),
        })?;
        c.validate().map_err(|m| SpatialError::Config {
            file: path.display().to_string(),
            message: m,
        })?;
        Ok(c)
    }

    /// Checks that bounds are finite, ordered and non-negative.
    pub fn validate(&self) -> Result<(), String> {
        let ordered = |name: &str, lo: f64, hi: f64| {
            if lo.is_finite() && hi.is_finite() && lo >= 0.0 && lo < hi {
                Ok(())
            } else {
                Err(format!(
                    "[{name}]: bounds {lo} and {hi} must be finite, non-negative and increasing"
                ))
            }
        };
        ordered("near", self.near.full_until_mm, self.near.zero_from_mm)?;
        ordered("far", self.far.zero_until_mm, self.far.full_from_mm)?;
        ordered(
            "depth",
            self.depth.peripheral_until_mm,
            self.depth.deep_from_mm,
        )?;
        if self.directional.max_landscape_cells < 4096 {
            return Err("[directional] max_landscape_cells must be at least 4096".into());
        }
        if self.topology.adjacency != 6 && self.topology.adjacency != 26 {
            return Err(format!(
                "[topology] adjacency = {}; use 6 or 26",
                self.topology.adjacency
            ));
        }
        Ok(())
    }

    /// The `near` set.
    pub fn near_set(&self) -> Trapezoid {
        Trapezoid::falling(self.near.full_until_mm, self.near.zero_from_mm)
    }

    /// The `far` set.
    pub fn far_set(&self) -> Trapezoid {
        Trapezoid::rising(self.far.zero_until_mm, self.far.full_from_mm)
    }

    /// The `peripheral_in` set over depth.
    pub fn peripheral_set(&self) -> Trapezoid {
        Trapezoid::falling(self.depth.peripheral_until_mm, self.depth.deep_from_mm)
    }

    /// The `deep_in` set over depth.
    pub fn deep_set(&self) -> Trapezoid {
        Trapezoid::rising(self.depth.peripheral_until_mm, self.depth.deep_from_mm)
    }
}
