//! Uniformity statistics against published formulas and data.

use spinwright::physics::layout::{uniformity, UniformityStats};

#[test]
fn hand_set() {
    // references.md: catches 1.0, 0.9, 0.7, 1.2 → CU = 84.21 %, DU_lq = 73.68 %
    // (Christiansen 1942; Keller & Merriam 1978, one can in the low quarter).
    let s = uniformity(&[1.0, 0.9, 0.7, 1.2]).unwrap();
    assert!((s.cu_percent - 84.21).abs() < 0.005, "{}", s.cu_percent);
    assert!(
        (s.du_lq_percent - 73.68).abs() < 0.005,
        "{}",
        s.du_lq_percent
    );
}

/// SplitMix64 (Steele, Lea & Flood 2014): a small seeded generator.
struct SplitMix(u64);

impl SplitMix {
    fn next_f64(&mut self) -> f64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^= z >> 31;
        ((z >> 11) as f64 + 0.5) / (1u64 << 53) as f64
    }

    /// Standard normal by the Box–Muller transform.
    fn normal(&mut self) -> f64 {
        let (u1, u2) = (self.next_f64(), self.next_f64());
        (-2.0 * u1.ln()).sqrt() * (2.0 * std::f64::consts::PI * u2).cos()
    }
}

#[test]
fn large_normal_sample_follows_normal_theory() {
    // references.md, normal-theory relation (exact for normal catches):
    // CU = 100(1 − 0.79788 CV), DU = 100(1 − 1.27111 CV); at CV 0.2: CU 84.04, DU 74.58.
    for &(seed, cv) in &[(7u64, 0.2f64), (11, 0.1), (2024, 0.25)] {
        let mut rng = SplitMix(seed);
        let catches: Vec<f64> = (0..200_000)
            .map(|_| (10.0 * (1.0 + cv * rng.normal())).max(0.0))
            .collect();
        let s: UniformityStats = uniformity(&catches).unwrap();
        let cu = 100.0 * (1.0 - 0.79788 * s.cv);
        let du = 100.0 * (1.0 - 1.27111 * s.cv);
        assert!(
            (s.cu_percent - cu).abs() < 0.5,
            "CU {} vs {cu}",
            s.cu_percent
        );
        assert!(
            (s.du_lq_percent - du).abs() < 0.5,
            "DU {} vs {du}",
            s.du_lq_percent
        );
        if cv == 0.2 {
            assert!((s.cu_percent - 84.04).abs() < 0.5);
            assert!((s.du_lq_percent - 74.58).abs() < 0.5);
        }
    }
}

/// Catch rates (in/h) of one lateral test, four can columns left of the
/// lateral (10, 20, 30, 40 ft out: l1..l4) and three right (r1..r3), six rows
/// 10 ft apart. Keller & Merriam (1978), *Farm Irrigation System Evaluation:
/// A Guide for Management*, Utah State University for USAID, Form II-1,
/// item 10, p. 29, as reproduced in the `catchcan$lateral` data set of the
/// R package spreval (Grabow), whose vignette "lateral-move systems" prints it.
/// Columns here: l4, l3, l2, l1, r1, r2, r3.
const LATERAL: [[f64; 7]; 6] = [
    [0.10, 0.21, 0.24, 0.28, 0.23, 0.21, 0.03],
    [0.11, 0.21, 0.26, 0.31, 0.31, 0.16, 0.01],
    [0.10, 0.16, 0.22, 0.32, 0.31, 0.15, 0.04],
    [0.10, 0.23, 0.27, 0.32, 0.27, 0.17, 0.03],
    [0.08, 0.20, 0.25, 0.30, 0.35, 0.19, 0.03],
    [0.06, 0.16, 0.19, 0.33, 0.27, 0.11, 0.04],
];

#[test]
fn published_lateral_test_overlapped_at_50_ft() {
    // Overlap at a 50 ft lateral spacing: the can x ft right of this lateral also
    // catches what fell 50 − x ft left of the next one (cans at 5, 15, …, 45 ft).
    let overlapped: Vec<[f64; 5]> = LATERAL
        .iter()
        .map(|row| {
            let left = |dist_ft: f64| -> f64 {
                // l1..l4 stand 5, 15, 25, 35 ft left; columns 3, 2, 1, 0.
                match dist_ft as i64 {
                    5 => row[3],
                    15 => row[2],
                    25 => row[1],
                    35 => row[0],
                    _ => 0.0,
                }
            };
            let right = |p: usize| row.get(4 + p).copied().unwrap_or(0.0);
            std::array::from_fn(|p| right(p) + left(50.0 - (5.0 + 10.0 * p as f64)))
        })
        .collect();
    // spreval vignette, overlapped right-side table, first row: 0.23 0.31 0.24 0.24 0.28.
    let first = overlapped[0];
    for (a, b) in first.iter().zip([0.23, 0.31, 0.24, 0.24, 0.28]) {
        assert!((a - b).abs() < 1e-12);
    }
    // spreval vignette (functions CU, DU, DU.lh; values rounded to whole %):
    // rows 1–3 ("upper") CU 87, DU 82, DU.lh 88; rows 4–6 ("lower") CU 86, DU 75, DU.lh 87.
    for (rows, cu, du, dulh) in [(0..3, 87.0, 82.0, 88.0), (3..6, 86.0, 75.0, 87.0)] {
        let catches: Vec<f64> = overlapped[rows].iter().flatten().copied().collect();
        let s = uniformity(&catches).unwrap();
        assert_eq!(s.count, 15);
        assert!((s.cu_percent - cu).abs() <= 0.5, "CU {}", s.cu_percent);
        assert!(
            (s.du_lq_percent - du).abs() <= 0.5,
            "DU {}",
            s.du_lq_percent
        );
        assert!(
            (s.du_lh_percent - dulh).abs() <= 0.5,
            "DU.lh {}",
            s.du_lh_percent
        );
        // 15 cans: the low quarter counts 4 (3.75 rounded), the low half 8 (7.5 rounded up).
        assert_eq!((s.low_quarter_count, s.low_half_count), (4, 8));
    }
}
