//! The picture of water on the ground: the application rate over one
//! repeating cell of a layout, drawn as characters, shared by the `layout`
//! text report and the terminal interface (and any later report page).
//!
//! Nothing here writes to a terminal; it decides *what* each map cell shows
//! and the callers decide *how*:
//!
//! - **The scale** is the application rate itself, mm/h (in/h in US units),
//!   running from a round value at or below the driest wet catch to a round
//!   value at or above the wettest ([`RateScale`]). Its colour is continuous
//!   ([`scale_rgb`]: pale sand through sea green and blue to indigo, lighter
//!   for less water); without colour the same scale is told by the height of
//!   a block, a water level that rises in eight steps ([`LEVEL_GLYPHS`]).
//!   The legend labels a few round values of the scale ([`RateScale::ticks`]).
//! - **The driest quarter** of the catch cells (the catches that DU_lq
//!   averages: the lowest n/4, counted as in `physics::layout`) carries a mark
//!   of its own ([`DRIEST_MARK`]) beside its level.
//! - **Dry ground** (below the head's wetting threshold, the rate that bounds
//!   the wetted radius, model.md M8) is drawn as dry ([`DRY_GLYPHS`]), not as
//!   the lowest level; the layout's dry share counts the same cells.
//! - **The heads** are drawn where the lattice of `physics::layout::overlap`
//!   puts them ([`head_points`]): the four corners of a square or rectangle
//!   cell; the two lower corners and the middle of the upper edge for a
//!   triangle (alternate rows shifted by half a spacing).
//!
//! Each map cell is two characters wide and one line tall, so it is about
//! square on a terminal; the map's edges are the cell's edges, so heads sit
//! on its corners (and the triangle's top head on the middle column).

use crate::physics::design::Layout;
use crate::physics::layout::{low_count, LayoutResult};
use crate::physics::pattern::M_S_TO_MM_H;
use crate::units::{format_number, to_display, unit_label, Dimension as D, UnitSystem};

/// The water level in a cell, from the lowest to the highest rate on the scale.
pub const LEVEL_GLYPHS: [char; 8] = ['▁', '▂', '▃', '▄', '▅', '▆', '▇', '█'];
/// The mark beside the level of a catch in the driest quarter.
pub const DRIEST_MARK: char = '▿';
/// A dry cell: bare ground.
pub const DRY_GLYPHS: [char; 2] = ['╌', '╌'];
/// A head (a riser seen from above).
pub const HEAD_GLYPHS: [char; 2] = ['(', ')'];

/// Colour of dry ground, RGB.
pub const DRY_RGB: (u8, u8, u8) = (150, 105, 60);
/// Colour of a head, RGB.
pub const HEAD_RGB: (u8, u8, u8) = (235, 70, 70);
/// Colour of the driest-quarter mark, RGB.
pub const DRIEST_RGB: (u8, u8, u8) = (240, 90, 200);

/// Anchors of the continuous colour scale, from the low end (t = 0) to the
/// high end (t = 1), evenly spaced; colours between are linear blends.
const SCALE_ANCHORS: [(u8, u8, u8); 4] = [
    (232, 216, 160), // pale sand
    (90, 190, 160),  // sea green
    (45, 125, 215),  // blue
    (85, 55, 175),   // indigo
];

/// The colour of a position `t` (0 = low end, 1 = high end) on the scale,
/// RGB; `t` outside 0..=1 is held at the ends.
pub fn scale_rgb(t: f64) -> (u8, u8, u8) {
    let t = if t.is_finite() {
        t.clamp(0.0, 1.0)
    } else {
        0.0
    };
    let segments = (SCALE_ANCHORS.len() - 1) as f64;
    let x = t * segments;
    let i = (x.floor() as usize).min(SCALE_ANCHORS.len() - 2);
    let f = x - i as f64;
    let (a, b) = match (SCALE_ANCHORS.get(i), SCALE_ANCHORS.get(i + 1)) {
        (Some(a), Some(b)) => (*a, *b),
        _ => return (0, 0, 0),
    };
    let mix = |p: u8, q: u8| (f64::from(p) + (f64::from(q) - f64::from(p)) * f).round() as u8;
    (mix(a.0, b.0), mix(a.1, b.1), mix(a.2, b.2))
}

/// The level glyph for a position `t` on the scale (0 = low end, 1 = high end).
pub fn level_glyph(t: f64) -> char {
    let n = LEVEL_GLYPHS.len();
    let t = if t.is_finite() {
        t.clamp(0.0, 1.0)
    } else {
        0.0
    };
    let k = ((t * n as f64).floor() as usize).min(n - 1);
    LEVEL_GLYPHS.get(k).copied().unwrap_or('█')
}

/// The rate scale of a map: its ends and a few round labelled values.
#[derive(Debug, Clone, PartialEq)]
pub struct RateScale {
    /// Low end, mm/h.
    pub lo_mm_h: f64,
    /// High end, mm/h.
    pub hi_mm_h: f64,
    /// Labelled values, lowest first: (rate mm/h, label in the display unit).
    pub ticks: Vec<(f64, String)>,
    /// The display unit, "mm/h" or "in/h".
    pub unit: &'static str,
}

impl RateScale {
    /// A scale over wet rates from `min_mm_h` to `max_mm_h`, with round ends
    /// and labels in the display unit of `units`. A nearly flat field gets a
    /// scale at least a fifth of the highest rate wide, so that sampling noise
    /// does not look like a pattern.
    pub fn new(min_mm_h: f64, max_mm_h: f64, units: UnitSystem) -> RateScale {
        let show = |mm_h: f64| to_display(D::ApplicationRate, mm_h / M_S_TO_MM_H, units);
        let back = |shown: f64| shown / show(1.0);
        let (mut lo, mut hi) = (show(min_mm_h.max(0.0)), show(max_mm_h.max(0.0)));
        if !(lo.is_finite() && hi.is_finite()) || hi <= 0.0 {
            lo = 0.0;
            hi = 1.0;
        }
        if lo > hi {
            std::mem::swap(&mut lo, &mut hi);
        }
        let least = 0.2 * hi;
        if hi - lo < least {
            let mid = 0.5 * (hi + lo);
            lo = (mid - 0.5 * least).max(0.0);
            hi = lo + least;
        }
        // A round step with at most six labelled values.
        let mut step = nice_step((hi - lo) / 4.0);
        let count = |step: f64| ((hi / step).ceil() - (lo / step).floor()).round().max(1.0);
        while count(step) > 5.0 {
            step = nice_step(step * 1.9);
        }
        let lo_r = (lo / step).floor() * step;
        let hi_r = (hi / step).ceil() * step;
        let n = count(step) as usize;
        let decimals = (-step.log10().floor()).max(0.0) as usize;
        let ticks = (0..=n)
            .map(|k| {
                let v = lo_r + k as f64 * step;
                (back(v), format!("{v:.decimals$}"))
            })
            .collect();
        RateScale {
            lo_mm_h: back(lo_r),
            hi_mm_h: back(hi_r),
            ticks,
            unit: unit_label(D::ApplicationRate, units),
        }
    }

    /// Position of `rate_mm_h` on the scale: 0 at the low end, 1 at the high end.
    pub fn position(&self, rate_mm_h: f64) -> f64 {
        let span = self.hi_mm_h - self.lo_mm_h;
        if span > 0.0 && rate_mm_h.is_finite() {
            ((rate_mm_h - self.lo_mm_h) / span).clamp(0.0, 1.0)
        } else {
            0.0
        }
    }
}

/// A round step (1, 2 or 5 × 10ᵏ) near `rough` (> 0).
fn nice_step(rough: f64) -> f64 {
    if !(rough.is_finite() && rough > 0.0) {
        return 1.0;
    }
    let p = 10f64.powf(rough.log10().floor());
    let m = rough / p;
    let f = if m < 1.5 {
        1.0
    } else if m < 3.5 {
        2.0
    } else if m < 7.5 {
        5.0
    } else {
        10.0
    };
    f * p
}

/// What one map cell shows.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum MapCell {
    /// A head stands here.
    Head,
    /// Less than the wetting threshold reaches this cell.
    Dry,
    /// Wet ground.
    Wet {
        /// The rate, mm/h.
        rate_mm_h: f64,
        /// Position on the scale, 0..=1.
        t: f64,
        /// The catch is in the driest quarter.
        driest: bool,
    },
}

/// What colours a character of the map or its legend.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Ink {
    /// A position on the rate scale, 0..=1.
    Scale(f64),
    /// Dry ground.
    Dry,
    /// A head.
    Head,
    /// The driest-quarter mark.
    Driest,
}

impl Ink {
    /// The ink's colour, RGB.
    pub fn rgb(self) -> (u8, u8, u8) {
        match self {
            Ink::Scale(t) => scale_rgb(t),
            Ink::Dry => DRY_RGB,
            Ink::Head => HEAD_RGB,
            Ink::Driest => DRIEST_RGB,
        }
    }
}

impl MapCell {
    /// The cell's two characters with their inks.
    pub fn inked(&self) -> [(char, Ink); 2] {
        let [a, b] = self.glyphs();
        match *self {
            MapCell::Head => [(a, Ink::Head), (b, Ink::Head)],
            MapCell::Dry => [(a, Ink::Dry), (b, Ink::Dry)],
            MapCell::Wet { t, driest, .. } => [
                (a, Ink::Scale(t)),
                (b, if driest { Ink::Driest } else { Ink::Scale(t) }),
            ],
        }
    }

    /// The cell's two characters.
    pub fn glyphs(&self) -> [char; 2] {
        match *self {
            MapCell::Head => HEAD_GLYPHS,
            MapCell::Dry => DRY_GLYPHS,
            MapCell::Wet { t, driest, .. } => {
                let g = level_glyph(t);
                [g, if driest { DRIEST_MARK } else { g }]
            }
        }
    }
}

/// Where the heads of a layout stand on its repeating cell [0, S] × [0, L],
/// as fractions (x / S, y / L) of the cell, following the lattice of
/// `physics::layout::overlap` (heads on rows j·L at i·S, odd rows of a
/// triangle shifted S/2).
pub fn head_points(layout: &Layout) -> Vec<(f64, f64)> {
    match layout {
        Layout::Square { .. } | Layout::Rectangle { .. } => {
            vec![(0.0, 0.0), (1.0, 0.0), (0.0, 1.0), (1.0, 1.0)]
        }
        Layout::Triangle { .. } => vec![(0.0, 0.0), (1.0, 0.0), (0.5, 1.0)],
    }
}

/// Where the heads stand, in words, for a map's title.
pub fn heads_in_words(layout: &Layout) -> &'static str {
    match layout {
        Layout::Square { .. } | Layout::Rectangle { .. } => "heads at the four corners",
        Layout::Triangle { .. } => {
            "heads at the two lower corners and the middle of the upper edge"
        }
    }
}

/// Title of a map of `layout`.
pub fn title(layout: &Layout) -> String {
    format!(
        "Application rate over one repeating cell ({})",
        heads_in_words(layout)
    )
}

/// The map of a layout: rows of cells, the top row first (the highest y).
#[derive(Debug, Clone, PartialEq)]
pub struct RateMap {
    /// Cells, top row first, left to right.
    pub rows: Vec<Vec<MapCell>>,
    /// The rate scale.
    pub scale: RateScale,
    /// The driest quarter is every catch at or below this rate, mm/h.
    pub driest_quarter_max_mm_h: f64,
    /// Catches drier than this count as dry, mm/h.
    pub dry_below_mm_h: f64,
}

impl RateMap {
    /// The map of `result` in at most `max_cols` cells across (each two
    /// characters wide) and `max_rows` lines, keeping the cell's shape. The
    /// count across is odd (so a triangle's top head has a middle column) and
    /// at most one more than the catch cells along a row. Empty when fewer
    /// than three columns or two rows fit.
    pub fn new(
        result: &LayoutResult,
        max_cols: usize,
        max_rows: usize,
        units: UnitSystem,
    ) -> RateMap {
        let grid = &result.grid.rate_mm_h;
        let ny = grid.len();
        let nx = grid.first().map_or(0, Vec::len);
        let dry_below = result.wetting_threshold_mm_h;
        let mut catches: Vec<f64> = grid.iter().flatten().copied().collect();
        catches.sort_by(f64::total_cmp);
        let driest_max = catches
            .get(low_count(catches.len(), 0.25).saturating_sub(1))
            .copied()
            .unwrap_or(0.0);
        let wet = catches.iter().copied().filter(|&c| c >= dry_below);
        let min = wet.clone().fold(f64::INFINITY, f64::min);
        let max = wet.fold(0.0, f64::max);
        let scale = RateScale::new(if min.is_finite() { min } else { 0.0 }, max, units);
        let mut map = RateMap {
            rows: Vec::new(),
            scale,
            driest_quarter_max_mm_h: driest_max,
            dry_below_mm_h: dry_below,
        };
        let (s, l) = (result.spacing_m, result.rows_m);
        if nx == 0 || ny == 0 || !(s > 0.0 && l > 0.0) {
            return map;
        }
        // Columns: odd, within the width and the catch grid; rows follow the
        // cell's shape, and fewer columns when the rows do not fit.
        let odd_at_most = |n: usize| if n % 2 == 0 { n.saturating_sub(1) } else { n };
        let mut cols = odd_at_most(max_cols.min(nx + 1));
        let rows_for = |c: usize| ((c.saturating_sub(1)) as f64 * l / s).round() as usize + 1;
        if max_rows >= 2 && rows_for(cols) > max_rows {
            let fit = ((max_rows - 1) as f64 * s / l).floor() as usize + 1;
            cols = odd_at_most(fit.min(cols));
        }
        let rows = rows_for(cols);
        if cols < 3 || rows < 2 || rows > max_rows {
            return map;
        }
        let heads: Vec<(usize, usize)> = head_points(&result.layout)
            .iter()
            .map(|&(fx, fy)| {
                (
                    (fx * (cols - 1) as f64).round() as usize,
                    (fy * (rows - 1) as f64).round() as usize,
                )
            })
            .collect();
        let (dx, dy) = (result.grid.dx_m, result.grid.dy_m);
        map.rows = (0..rows)
            .rev()
            .map(|r| {
                let y = r as f64 * l / (rows - 1) as f64;
                let iy = ((y / dy).floor().max(0.0) as usize).min(ny - 1);
                (0..cols)
                    .map(|c| {
                        if heads.contains(&(c, r)) {
                            return MapCell::Head;
                        }
                        let x = c as f64 * s / (cols - 1) as f64;
                        let ix = ((x / dx).floor().max(0.0) as usize).min(nx - 1);
                        let v = grid
                            .get(iy)
                            .and_then(|row| row.get(ix))
                            .copied()
                            .unwrap_or(0.0);
                        if v < dry_below || v <= 0.0 {
                            MapCell::Dry
                        } else {
                            MapCell::Wet {
                                rate_mm_h: v,
                                t: map.scale.position(v),
                                driest: v <= driest_max,
                            }
                        }
                    })
                    .collect()
            })
            .collect();
        map
    }

    /// The map as lines of text, two characters per cell.
    pub fn text_lines(&self) -> Vec<String> {
        self.painted_lines(&plain)
    }

    /// The map as lines of text, each character passed through `paint` with
    /// its ink (to colour it for a terminal or a page).
    pub fn painted_lines(&self, paint: &dyn Fn(char, Ink) -> String) -> Vec<String> {
        self.rows
            .iter()
            .map(|row| {
                row.iter()
                    .flat_map(MapCell::inked)
                    .map(|(c, ink)| paint(c, ink))
                    .collect()
            })
            .collect()
    }

    /// Legend entries of the scale, the highest value first: the level's
    /// glyphs, its position on the scale and its label (number only).
    pub fn scale_entries(&self) -> Vec<([char; 2], f64, String)> {
        self.scale
            .ticks
            .iter()
            .rev()
            .map(|(v, label)| {
                let t = self.scale.position(*v);
                let g = level_glyph(t);
                ([g, g], t, label.clone())
            })
            .collect()
    }

    /// The driest-quarter threshold in the display unit of `units`.
    pub fn driest_label(&self, units: UnitSystem) -> String {
        format_number(to_display(
            D::ApplicationRate,
            self.driest_quarter_max_mm_h / M_S_TO_MM_H,
            units,
        ))
    }

    /// The legend as text lines for a report: the scale, then the marks.
    pub fn legend_text(&self, units: UnitSystem) -> Vec<String> {
        self.painted_legend(units, &plain)
    }

    /// The legend with each glyph passed through `paint` with its ink.
    pub fn painted_legend(
        &self,
        units: UnitSystem,
        paint: &dyn Fn(char, Ink) -> String,
    ) -> Vec<String> {
        let pair = |g: [char; 2], ink: Ink| format!("{}{}", paint(g[0], ink), paint(g[1], ink));
        let scale: Vec<String> = self
            .scale_entries()
            .into_iter()
            .rev()
            .map(|(g, t, label)| format!("{} {label}", pair(g, Ink::Scale(t))))
            .collect();
        let dt = self.scale.position(self.driest_quarter_max_mm_h);
        vec![
            format!("rate, {}:  {}", self.scale.unit, scale.join("  ")),
            format!(
                "{}{} driest quarter (≤ {} {})   {} dry   {} head",
                paint(level_glyph(dt), Ink::Scale(dt)),
                paint(DRIEST_MARK, Ink::Driest),
                self.driest_label(units),
                self.scale.unit,
                pair(DRY_GLYPHS, Ink::Dry),
                pair(HEAD_GLYPHS, Ink::Head),
            ),
        ]
    }
}

/// A character as it is, without colour.
fn plain(c: char, _: Ink) -> String {
    c.to_string()
}

/// The run time that gives the driest quarter the mean depth, as a factor on
/// the run time for the mean depth, in words: "×1.15 (+15 %)"; "—" when no
/// run time is enough (nothing reaches the driest quarter).
pub fn runtime_factor_words(factor: Option<f64>) -> String {
    match factor {
        Some(f) if f.is_finite() => format!("×{f:.2} (+{:.0} %)", 100.0 * (f - 1.0)),
        _ => "— (the driest quarter gets no water)".to_string(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::layout::{overlap, MeasuredLeg, OverlapOptions};

    fn result(layout: Layout) -> LayoutResult {
        // A cone pattern, 12 mm/h at the head to nothing at 7 m.
        let leg = MeasuredLeg::new(vec![(0.0, 12.0), (7.0, 0.0)]).unwrap();
        overlap(&layout, &leg, &OverlapOptions::default()).unwrap()
    }

    #[test]
    fn heads_sit_on_the_lattice() {
        let sq = RateMap::new(
            &result(Layout::Square { spacing_m: 8.0 }),
            21,
            40,
            UnitSystem::Metric,
        );
        assert_eq!(sq.rows.len(), 21);
        let last = sq.rows.len() - 1;
        for (c, r) in [(0, 0), (20, 0), (0, last), (20, last)] {
            assert_eq!(sq.rows[r][c], MapCell::Head, "({c}, {r})");
        }
        assert_eq!(
            sq.rows
                .iter()
                .flatten()
                .filter(|c| **c == MapCell::Head)
                .count(),
            4
        );
        // Triangle: two heads on the lower corners, one mid-edge on top (top row first).
        let tri = RateMap::new(
            &result(Layout::Triangle { spacing_m: 8.0 }),
            21,
            40,
            UnitSystem::Metric,
        );
        let last = tri.rows.len() - 1;
        assert_eq!(tri.rows[last][0], MapCell::Head);
        assert_eq!(tri.rows[last][20], MapCell::Head);
        assert_eq!(tri.rows[0][10], MapCell::Head);
        assert_ne!(tri.rows[0][0], MapCell::Head);
        assert_ne!(tri.rows[0][20], MapCell::Head);
        // Rows S·√3/2 high: 20·0.866 = 17.3 → 17 steps.
        assert_eq!(tri.rows.len(), 18);
    }

    #[test]
    fn the_triangle_title_puts_one_head_mid_edge() {
        let t = title(&Layout::Triangle { spacing_m: 8.0 });
        assert!(!t.contains("heads at the corners"), "{t}");
        assert!(t.contains("middle of the upper edge"), "{t}");
        assert!(title(&Layout::Square { spacing_m: 8.0 }).contains("four corners"));
    }

    #[test]
    fn the_driest_quarter_is_marked_and_wide_spacing_leaves_dry_ground() {
        // Heads 7 m reach 16 m apart: the middle of the cell stays dry.
        let r = result(Layout::Square { spacing_m: 16.0 });
        let map = RateMap::new(&r, 41, 41, UnitSystem::Metric);
        let cells: Vec<MapCell> = map.rows.iter().flatten().copied().collect();
        let centre = map.rows[20][20];
        assert_eq!(centre, MapCell::Dry);
        assert!(map.text_lines()[20].contains("╌╌"));
        // The driest quarter here is all dry catches; wet cells are not marked.
        assert!(cells
            .iter()
            .all(|c| !matches!(c, MapCell::Wet { driest: true, rate_mm_h, .. } if *rate_mm_h > map.driest_quarter_max_mm_h)));
        // A closer spacing: no dry ground, and about a quarter of the cells marked.
        let r = result(Layout::Square { spacing_m: 6.0 });
        let map = RateMap::new(&r, 41, 41, UnitSystem::Metric);
        let n = map.rows.iter().flatten().count();
        let marked = map
            .rows
            .iter()
            .flatten()
            .filter(|c| matches!(c, MapCell::Wet { driest: true, .. }))
            .count();
        assert!(!map.rows.iter().flatten().any(|c| *c == MapCell::Dry));
        assert!(
            (marked as f64 / n as f64 - 0.25).abs() < 0.08,
            "{marked} of {n}"
        );
        assert!(map.text_lines().concat().contains(DRIEST_MARK));
    }

    #[test]
    fn scale_ends_are_round_and_cover_the_rates() {
        let s = RateScale::new(11.3, 21.7, UnitSystem::Metric);
        assert_eq!(s.unit, "mm/h");
        assert!(s.lo_mm_h <= 11.3 && s.hi_mm_h >= 21.7);
        assert!((s.lo_mm_h - 10.0).abs() < 1e-9, "{}", s.lo_mm_h);
        assert!((s.hi_mm_h - 25.0).abs() < 1e-9, "{}", s.hi_mm_h);
        let labels: Vec<&str> = s.ticks.iter().map(|t| t.1.as_str()).collect();
        assert_eq!(labels, ["10", "15", "20", "25"]);
        // US units: round values of in/h (25.4 mm/h = 1 in/h, exact).
        let us = RateScale::new(11.3, 21.7, UnitSystem::Us);
        assert_eq!(us.unit, "in/h");
        assert!((us.lo_mm_h - 0.4 * 25.4).abs() < 1e-9, "{}", us.lo_mm_h);
        let labels: Vec<&str> = us.ticks.iter().map(|t| t.1.as_str()).collect();
        assert_eq!(labels, ["0.4", "0.5", "0.6", "0.7", "0.8", "0.9"]);
        // A flat field keeps a scale a fifth of its rate wide; an empty one does not panic.
        let flat = RateScale::new(15.0, 15.0, UnitSystem::Metric);
        assert!(flat.hi_mm_h - flat.lo_mm_h >= 3.0 - 1e-9);
        let none = RateScale::new(0.0, 0.0, UnitSystem::Metric);
        assert!(none.hi_mm_h > none.lo_mm_h);
        assert_eq!(none.position(f64::NAN), 0.0);
    }

    #[test]
    fn colour_and_level_rise_with_the_rate() {
        assert_eq!(scale_rgb(0.0), SCALE_ANCHORS[0]);
        assert_eq!(scale_rgb(1.0), SCALE_ANCHORS[3]);
        assert_eq!(scale_rgb(f64::NAN), SCALE_ANCHORS[0]);
        assert_eq!(level_glyph(0.0), '▁');
        assert_eq!(level_glyph(1.0), '█');
        assert_eq!(level_glyph(0.5), '▅');
        // Continuous: a small step in rate is a small step in colour.
        let (a, b) = (scale_rgb(0.50), scale_rgb(0.51));
        assert!((i32::from(a.2) - i32::from(b.2)).abs() <= 3);
        // Lighter for less water (sum of the channels falls along the scale).
        let sum = |c: (u8, u8, u8)| u32::from(c.0) + u32::from(c.1) + u32::from(c.2);
        assert!(sum(scale_rgb(0.0)) > sum(scale_rgb(0.5)));
        assert!(sum(scale_rgb(0.5)) > sum(scale_rgb(1.0)));
    }

    #[test]
    fn runtime_factor_in_words() {
        assert_eq!(runtime_factor_words(Some(1.15)), "×1.15 (+15 %)");
        assert!(runtime_factor_words(None).starts_with('—'));
    }
}
