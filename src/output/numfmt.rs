//! Numbers to text for the text outputs (LAS `~A`, CSV), fast.
//!
//! A field run writes tens of millions of samples; the standard library's
//! fixed-precision formatting (`{:.4}`) works from the exact binary expansion
//! and took most of a text-writing run's time (profiled at 200 wells: over
//! half the samples in its exact-digit routines). [`push_fixed`] gives the
//! same text as `format!("{v:.d$}")`, byte for byte, by integer arithmetic in
//! the common case and falls back to the standard library only where that
//! could disagree: near a rounding tie, for very large values or more than
//! [`FAST_MAX_DECIMALS`] decimals. [`push_shortest`] writes the shortest text
//! that reads back to the same `f64` (the Żmij algorithm, through the `zmij`
//! crate: the same crate and so the same text as polars' CSV writer).

/// Most decimals the integer path handles; more go to the standard library.
pub const FAST_MAX_DECIMALS: usize = 9;

const POW10: [u64; FAST_MAX_DECIMALS + 1] = [
    1,
    10,
    100,
    1_000,
    10_000,
    100_000,
    1_000_000,
    10_000_000,
    100_000_000,
    1_000_000_000,
];

/// Scaled values at or above this (2^52) leave no fraction bits to decide the
/// rounding with.
const FAST_SCALED_LIMIT: f64 = 4_503_599_627_370_496.0;

/// `|v| × 10^d` rounded to the nearest integer, when that can be decided from
/// the one rounded product; `None` near a tie or out of range.
///
/// The product carries one rounding error of at most half an ulp (≤ |x|·ε/2);
/// unless the fraction lies within that of one half, the rounded product and
/// the exact value round the same way.
fn scaled_digits(v: f64, d: usize) -> Option<u64> {
    let scale = *POW10.get(d)? as f64; // exact: 10^9 < 2^53
    let s = v.abs() * scale;
    if !s.is_finite() || s >= FAST_SCALED_LIMIT {
        return None;
    }
    // truncation is the floor here (s ≥ 0), without a libm call
    let r = s as u64;
    let frac = s - r as f64; // exact for s < 2^52
    if (frac - 0.5).abs() <= 2.0 * s * f64::EPSILON {
        return None;
    }
    Some(if frac > 0.5 { r + 1 } else { r })
}

/// "00" to "99", two bytes each.
const DIGIT_PAIRS: &[u8; 200] = b"\
    0001020304050607080910111213141516171819\
    2021222324252627282930313233343536373839\
    4041424344454647484950515253545556575859\
    6061626364656667686970717273747576777879\
    8081828384858687888990919293949596979899";

/// Append `v` with exactly `decimals` decimals: the text of
/// `format!("{v:.decimals$}")`, including `-` on negative values that round
/// to zero and `NaN` / `inf` for those.
pub fn push_fixed(out: &mut Vec<u8>, v: f64, decimals: usize) {
    push_fixed_right(out, v, decimals, 0);
}

/// [`push_fixed`] right-aligned in `width` characters (wider text is
/// written whole).
pub fn push_fixed_right(out: &mut Vec<u8>, v: f64, decimals: usize, width: usize) {
    let Some(r) = scaled_digits(v, decimals) else {
        let text = format!("{v:.decimals$}");
        push_right(out, text.as_bytes(), width);
        return;
    };
    // the decimals as a constant, so the splits below are multiplications
    // rather than a hardware division per value
    let mut tmp = [0u8; FAST_TEXT_MAX];
    let pos = match decimals {
        0 => digits::<0>(&mut tmp, r),
        1 => digits::<1>(&mut tmp, r),
        2 => digits::<2>(&mut tmp, r),
        3 => digits::<3>(&mut tmp, r),
        4 => digits::<4>(&mut tmp, r),
        5 => digits::<5>(&mut tmp, r),
        6 => digits::<6>(&mut tmp, r),
        7 => digits::<7>(&mut tmp, r),
        8 => digits::<8>(&mut tmp, r),
        _ => digits::<9>(&mut tmp, r),
    };
    let pos = if v.is_sign_negative() {
        tmp[pos - 1] = b'-';
        pos - 1
    } else {
        pos
    };
    push_right(out, &tmp[pos..], width);
}

/// Longest text the integer path writes: 16 digits, a point, a sign.
const FAST_TEXT_MAX: usize = 24;

/// Write `r / 10^D` with `D` decimals (the point included) at the end of
/// `tmp`, from the right; returns where the text starts (a sign still fits).
#[inline(always)]
fn digits<const D: usize>(tmp: &mut [u8; FAST_TEXT_MAX], r: u64) -> usize {
    let mut pos = FAST_TEXT_MAX;
    let p = POW10[D];
    let (mut whole, mut frac) = (r / p, r % p);
    // two digits at a time where there are two
    let mut left = D;
    while left >= 2 {
        pos -= 2;
        let k = (frac % 100) as usize * 2;
        tmp[pos..pos + 2].copy_from_slice(&DIGIT_PAIRS[k..k + 2]);
        frac /= 100;
        left -= 2;
    }
    if left == 1 {
        pos -= 1;
        tmp[pos] = b'0' + frac as u8;
    }
    if D > 0 {
        pos -= 1;
        tmp[pos] = b'.';
    }
    while whole >= 100 {
        pos -= 2;
        let k = (whole % 100) as usize * 2;
        tmp[pos..pos + 2].copy_from_slice(&DIGIT_PAIRS[k..k + 2]);
        whole /= 100;
    }
    if whole >= 10 {
        pos -= 2;
        let k = whole as usize * 2;
        tmp[pos..pos + 2].copy_from_slice(&DIGIT_PAIRS[k..k + 2]);
    } else {
        pos -= 1;
        tmp[pos] = b'0' + whole as u8;
    }
    pos
}

/// Append `text` right-aligned in `width` characters.
pub fn push_right(out: &mut Vec<u8>, text: &[u8], width: usize) {
    let pad = width.saturating_sub(text.len());
    if pad > 0 {
        out.resize(out.len() + pad, b' ');
    }
    out.extend_from_slice(text);
}

/// Append the shortest text that reads back to `v` (`1.0`, `0.21`, `1e-7`);
/// `NaN`, `inf`, `-inf` for the non-finite.
pub fn push_shortest(out: &mut Vec<u8>, v: f64) {
    let mut buf = zmij::Buffer::new();
    out.extend_from_slice(buf.format(v).as_bytes());
}

/// Append a whole number.
pub fn push_int(out: &mut Vec<u8>, v: i64) {
    let mut buf = itoa::Buffer::new();
    out.extend_from_slice(buf.format(v).as_bytes());
}

#[cfg(test)]
mod tests {
    use super::*;
    use rand::{Rng, SeedableRng};

    fn fixed(v: f64, d: usize) -> String {
        let mut out = Vec::new();
        push_fixed(&mut out, v, d);
        String::from_utf8(out).expect("ascii")
    }

    /// The reference is the standard library's exact formatting.
    #[track_caller]
    fn same_as_std(v: f64, d: usize) {
        assert_eq!(fixed(v, d), format!("{v:.d$}"), "value {v:e}, {d} decimals");
    }

    #[test]
    fn matches_std_on_hand_picked_values() {
        // ties in decimal that are not ties in binary (1.005 is 1.00499…),
        // exact binary ties (0.125, 2.5), negatives that round to zero, -0,
        // the range edges and non-finite values
        let values = [
            0.0,
            -0.0,
            1.0,
            0.5,
            1.5,
            2.5,
            0.125,
            0.375,
            1.005,
            2.675,
            -0.00004,
            -0.00005,
            -0.00006,
            0.99995,
            9.99995,
            -999.25,
            1234.56789,
            4_503_599_627.370_496,
            4.5e15,
            1e16,
            1e300,
            5e-324,
            f64::NAN,
            f64::INFINITY,
            f64::NEG_INFINITY,
        ];
        for &v in &values {
            for d in 0..=12 {
                same_as_std(v, d);
            }
        }
    }

    #[test]
    fn matches_std_on_random_values() {
        // seeded: log values over 24 decades, both signs, every precision the
        // integer path takes and a few it hands back
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(7);
        for _ in 0..200_000 {
            let mag = 10f64.powf(rng.random_range(-12.0..12.0));
            let v = if rng.random_bool(0.5) { -mag } else { mag };
            let d = rng.random_range(0..=11);
            same_as_std(v, d);
        }
        // values on a decimal grid and their next neighbours in binary: the
        // places a tie could be misjudged
        for i in 0..100_000u32 {
            let d = (i % 6) as usize + 1;
            let grid = f64::from(i) / 10f64.powi(d as i32 + 1) + 0.5 / 10f64.powi(d as i32);
            for v in [grid, grid.next_up(), grid.next_down()] {
                same_as_std(v, d);
            }
        }
    }

    /// Right-aligned text equals the standard library's `{v:>w$.d$}`, for
    /// widths inside and beyond the fast path's fixed block, appended after
    /// text already in the buffer.
    #[test]
    fn right_aligned_matches_std_at_every_width() {
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(11);
        for _ in 0..20_000 {
            let mag = 10f64.powf(rng.random_range(-6.0..15.0));
            let v = if rng.random_bool(0.3) { -mag } else { mag };
            let d = rng.random_range(0..=9);
            let w = rng.random_range(0..=40);
            let mut out = b"x,".to_vec();
            push_fixed_right(&mut out, v, d, w);
            assert_eq!(
                String::from_utf8(out).expect("ascii"),
                format!("x,{v:>w$.d$}"),
                "value {v:e}, {d} decimals, width {w}"
            );
        }
    }

    #[test]
    fn right_aligned_and_shortest() {
        let mut out = Vec::new();
        push_fixed_right(&mut out, -1.25, 2, 8);
        push_fixed_right(&mut out, 123456.0, 1, 3);
        push_right(&mut out, b"x", 2);
        push_fixed_right(&mut out, f64::NAN, 2, 4);
        assert_eq!(out, b"   -1.25123456.0 x NaN");
        let mut out = Vec::new();
        for v in [1.0, 0.21, 1e-7, -2.5e20] {
            push_shortest(&mut out, v);
            out.push(b' ');
        }
        assert_eq!(out, b"1.0 0.21 1e-7 -2.5e+20 ");
        let mut out = Vec::new();
        push_int(&mut out, -42);
        assert_eq!(out, b"-42");
    }
}
