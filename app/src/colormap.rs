//! The wafer map's colour scale: a straight line in the Oklab colour space from a dark blue
//! to a light yellow.
//!
//! # Why this scale
//! - **Perceptually uniform**: Oklab (Ottosson 2020, "A perceptual color space for image
//!   processing") is built so that equal distances look like equal colour differences, so
//!   equal steps along a straight line in it look like equal steps of the value.
//! - **Colour-blind safe and greyscale safe**: it runs from blue to yellow, the one hue axis
//!   that the common red-green colour-vision deficiencies keep, in the family of *cividis*
//!   (Nuñez, Anderton and Renslow 2018, PLoS ONE 13(7): e0199239), and its lightness rises
//!   steadily from 0.27 to 0.91, so a greyscale print still orders the values.
//!
//! Our own end points (Oklab L, a, b): [`DARK`] and [`LIGHT`]; every colour between them
//! lies inside the sRGB gamut (tested), so nothing is clipped.

use crate::chart::Color;

/// The low end of the scale, Oklab (L, a, b): a dark blue, sRGB about #0b2059.
pub const DARK: [f64; 3] = [0.27, -0.01, -0.105];
/// The high end of the scale, Oklab (L, a, b): a light yellow, sRGB about #f7e45e.
pub const LIGHT: [f64; 3] = [0.91, -0.03, 0.15];

/// How the scale is described under the map.
pub const DESCRIPTION: &str = "colour scale: dark blue (low) to light yellow (high), a straight \
    line in the Oklab colour space (perceptually uniform, lightness rising steadily, in the \
    cividis family: colour-blind and greyscale safe)";

/// Number of entries of [`Ramp`]'s table.
pub const STEPS: usize = 256;

/// The scale as a table of [`STEPS`] sRGB colours, for colouring many pixels quickly.
#[derive(Debug, Clone, PartialEq)]
pub struct Ramp {
    table: Vec<[u8; 3]>,
}

impl Default for Ramp {
    fn default() -> Ramp {
        Ramp::new()
    }
}

impl Ramp {
    /// The table, [`DARK`] to [`LIGHT`].
    pub fn new() -> Ramp {
        Ramp {
            table: (0..STEPS)
                .map(|k| at(k as f64 / (STEPS - 1) as f64))
                .collect(),
        }
    }

    /// The colour of position `t` (0 = low end, 1 = high end; clamped), from the table.
    pub fn color(&self, t: f64) -> [u8; 3] {
        self.table[index(t)]
    }
}

/// The table entry of position `t` (clamped to 0..1; NaN counts as 0).
fn index(t: f64) -> usize {
    let t = if t.is_nan() { 0.0 } else { t.clamp(0.0, 1.0) };
    (t * (STEPS - 1) as f64).round() as usize
}

/// The colour of position `t` (0..1, clamped), computed exactly.
pub fn at(t: f64) -> [u8; 3] {
    let t = if t.is_nan() { 0.0 } else { t.clamp(0.0, 1.0) };
    let lab: [f64; 3] = std::array::from_fn(|i| DARK[i] + (LIGHT[i] - DARK[i]) * t);
    srgb_from_oklab(lab)
}

/// [`at`] as a chart colour.
pub fn color_at(t: f64) -> Color {
    let [r, g, b] = at(t);
    Color(r, g, b)
}

/// The sRGB transfer function, linear light to encoded (IEC 61966-2-1).
fn encode(c: f64) -> f64 {
    if c <= 0.003_130_8 {
        12.92 * c
    } else {
        1.055 * c.powf(1.0 / 2.4) - 0.055
    }
}

/// The inverse of [`encode`].
fn decode(c: f64) -> f64 {
    if c <= 0.040_45 {
        c / 12.92
    } else {
        ((c + 0.055) / 1.055).powf(2.4)
    }
}

/// Oklab (L, a, b) to linear sRGB (not clamped). Matrices from Ottosson (2020).
pub fn linear_srgb_from_oklab([l, a, b]: [f64; 3]) -> [f64; 3] {
    let l_ = (l + 0.396_337_777_4 * a + 0.215_803_757_3 * b).powi(3);
    let m_ = (l - 0.105_561_345_8 * a - 0.063_854_172_8 * b).powi(3);
    let s_ = (l - 0.089_484_177_5 * a - 1.291_485_548_0 * b).powi(3);
    [
        4.076_741_662_1 * l_ - 3.307_711_591_3 * m_ + 0.230_969_929_2 * s_,
        -1.268_438_004_6 * l_ + 2.609_757_401_1 * m_ - 0.341_319_396_5 * s_,
        -0.004_196_086_3 * l_ - 0.703_418_614_7 * m_ + 1.707_614_701_0 * s_,
    ]
}

/// Oklab to 8-bit sRGB (each channel clamped to the gamut, then rounded).
pub fn srgb_from_oklab(lab: [f64; 3]) -> [u8; 3] {
    linear_srgb_from_oklab(lab).map(|c| (encode(c.clamp(0.0, 1.0)) * 255.0).round() as u8)
}

/// 8-bit sRGB to Oklab (L, a, b). Matrices from Ottosson (2020).
pub fn oklab_from_srgb(rgb: [u8; 3]) -> [f64; 3] {
    let [r, g, b] = rgb.map(|c| decode(f64::from(c) / 255.0));
    let l = (0.412_221_470_8 * r + 0.536_332_536_3 * g + 0.051_445_992_9 * b).cbrt();
    let m = (0.211_903_498_2 * r + 0.680_699_545_1 * g + 0.107_396_956_6 * b).cbrt();
    let s = (0.088_302_461_9 * r + 0.281_718_837_6 * g + 0.629_978_700_5 * b).cbrt();
    [
        0.210_454_255_3 * l + 0.793_617_785_0 * m - 0.004_072_046_8 * s,
        1.977_998_495_1 * l - 2.428_592_205_0 * m + 0.450_593_709_9 * s,
        0.025_904_037_1 * l + 0.782_771_766_2 * m - 0.808_675_766_0 * s,
    ]
}

/// Relative luminance of an sRGB colour (WCAG 2.x definition), for the greyscale check.
pub fn luminance(rgb: [u8; 3]) -> f64 {
    let [r, g, b] = rgb.map(|c| decode(f64::from(c) / 255.0));
    0.2126 * r + 0.7152 * g + 0.0722 * b
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn oklab_matches_published_values() {
        // sRGB red is oklab(0.628 0.225 0.126) and white oklab(1 0 0): the worked values of
        // CSS Color Module Level 4 (W3C), section on Oklab (from memory, 3 decimals).
        let red = oklab_from_srgb([255, 0, 0]);
        assert_abs_diff_eq!(red[0], 0.628, epsilon = 5e-4);
        assert_abs_diff_eq!(red[1], 0.225, epsilon = 5e-4);
        assert_abs_diff_eq!(red[2], 0.126, epsilon = 5e-4);
        let white = oklab_from_srgb([255, 255, 255]);
        assert_abs_diff_eq!(white[0], 1.0, epsilon = 1e-6);
        assert_abs_diff_eq!(white[1], 0.0, epsilon = 1e-6);
        assert_abs_diff_eq!(white[2], 0.0, epsilon = 1e-6);
    }

    #[test]
    fn round_trip_through_oklab() {
        for rgb in [
            [0, 0, 0],
            [255, 255, 255],
            [12, 200, 77],
            [250, 3, 128],
            [90, 90, 91],
        ] {
            assert_eq!(srgb_from_oklab(oklab_from_srgb(rgb)), rgb, "{rgb:?}");
        }
    }

    #[test]
    fn the_whole_scale_lies_inside_the_srgb_gamut() {
        for k in 0..=1000 {
            let t = f64::from(k) / 1000.0;
            let lab: [f64; 3] = std::array::from_fn(|i| DARK[i] + (LIGHT[i] - DARK[i]) * t);
            for c in linear_srgb_from_oklab(lab) {
                assert!((-1e-9..=1.0 + 1e-9).contains(&c), "t = {t}: channel {c}");
            }
        }
    }

    #[test]
    fn lightness_and_luminance_rise_steadily() {
        // Greyscale safety: every step is lighter than the one before, in Oklab lightness of
        // the 8-bit colours and in WCAG relative luminance.
        let ramp = Ramp::new();
        let colours: Vec<[u8; 3]> = (0..STEPS).map(|k| ramp.table[k]).collect();
        for pair in colours.windows(2) {
            assert!(oklab_from_srgb(pair[1])[0] > oklab_from_srgb(pair[0])[0] - 1e-3);
            assert!(luminance(pair[1]) >= luminance(pair[0]) - 1e-4, "{pair:?}");
        }
        // Ends far apart in luminance: a contrast ratio (WCAG) above 7.
        let (lo, hi) = (luminance(colours[0]), luminance(colours[STEPS - 1]));
        assert!((hi + 0.05) / (lo + 0.05) > 7.0);
    }

    #[test]
    fn equal_steps_look_equal() {
        // Perceptual uniformity: the Oklab distance between neighbours of 11 evenly spaced
        // colours is the same to within the 8-bit rounding.
        let lab: Vec<[f64; 3]> = (0..=10)
            .map(|k| oklab_from_srgb(at(f64::from(k) / 10.0)))
            .collect();
        let steps: Vec<f64> = lab
            .windows(2)
            .map(|w| {
                (0..3)
                    .map(|i| (w[1][i] - w[0][i]).powi(2))
                    .sum::<f64>()
                    .sqrt()
            })
            .collect();
        let mean = steps.iter().sum::<f64>() / steps.len() as f64;
        for s in steps {
            assert!((s - mean).abs() < 0.006, "step {s} vs mean {mean}");
        }
    }

    #[test]
    fn the_table_and_the_exact_colour_agree_and_clamp() {
        let ramp = Ramp::new();
        assert_eq!(ramp.color(0.0), at(0.0));
        assert_eq!(ramp.color(1.0), at(1.0));
        assert_eq!(ramp.color(-3.0), at(0.0));
        assert_eq!(ramp.color(7.0), at(1.0));
        assert_eq!(ramp.color(f64::NAN), at(0.0));
        assert_eq!(ramp.color(0.5), at(128.0 / 255.0));
        // The stated sRGB of the ends.
        assert_eq!(at(0.0), [0x0b, 0x20, 0x59]);
        assert_eq!(at(1.0), [0xf7, 0xe4, 0x5e]);
    }
}
