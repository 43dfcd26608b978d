//! Cutting rings at the edge of a world map: the meridian opposite the central one.
//!
//! A world map has an edge, and some land lies across it whatever the central meridian: in
//! Natural Earth's countries every meridian crosses some country (Russia reaches past 180
//! degrees to Chukotka, the Aleutians cross it, and so on round the globe). A ring drawn across
//! the edge would run from one side of the map to the other. So a ring that crosses the edge is
//! cut there into pieces, one on each side, and each piece is closed along the edge (the
//! meridian, followed in steps of at most a degree so that it bends as the map's edge does).
//! This is the antimeridian cutting every world-map renderer does (common practice).
//!
//! A ring that goes right round a pole (Antarctica) meets the edge once: it is opened there and
//! closed down the edge to the pole, along the pole (a line on Equal Earth) and back up the other
//! side of the edge, so that it covers the land up to the pole.
//!
//! Nested pieces (a bay that crosses the edge inside a peninsula that crosses it too) are each
//! closed on their own and may overlap; for the coastlines of world data sets the pieces on one
//! side do not nest.

use super::{LonLat, normalise_lon};

/// The pieces of `ring` (an open ring of `[longitude, latitude]`) on either side of the meridian
/// opposite `lon0`, each an open ring whose points on the edge have the longitude of their side
/// (`lon0 + 180` on the east, `lon0 - 180` on the west, so that they project to their side).
/// A ring that does not cross the edge comes back as it is; a ring round a pole comes back as one
/// ring closed along the pole.
///
/// # Complexity
/// O(n + e) for `n` points and `e` points added along the edge.
pub fn split_at_edge(ring: &[LonLat], lon0: f64) -> Vec<Vec<LonLat>> {
    let n = ring.len();
    if n < 3 {
        return vec![ring.to_vec()];
    }
    // Offsets from the central meridian, unwrapped along the ring the short way round.
    let mut u = Vec::with_capacity(n + 1);
    u.push(normalise_lon(ring[0][0] - lon0));
    for i in 1..=n {
        let step = normalise_lon(ring[i % n][0] - ring[i - 1][0]);
        u.push(u[i - 1] + step);
    }
    // Round a pole: the ring winds once round it.
    let round_pole = (u[n] - u[0]).abs() > 180.0;
    // The sheet a stretch of offsets lies on: 0 for [-180, 180], 1 for [180, 540], and so on.
    let sheet = |x: f64| ((x + 180.0) / 360.0).floor() as i64;
    // Cut each edge where it crosses an edge line, and label every sub-edge by the sheet of its
    // middle.
    struct Sub {
        from: LonLat, // (offset, latitude)
        to: LonLat,
        sheet: i64,
    }
    let mut subs: Vec<Sub> = Vec::new();
    for i in 0..n {
        let (a, b) = ([u[i], ring[i][1]], [u[i + 1], ring[(i + 1) % n][1]]);
        let mut cuts: Vec<LonLat> = Vec::new();
        let (lo, hi) = (a[0].min(b[0]), a[0].max(b[0]));
        let mut k = sheet(lo);
        loop {
            let line = 180.0 + 360.0 * k as f64;
            if line >= hi {
                break;
            }
            if line > lo {
                let t = (line - a[0]) / (b[0] - a[0]);
                cuts.push([line, a[1] + t * (b[1] - a[1])]);
            }
            k += 1;
        }
        if b[0] < a[0] {
            cuts.reverse();
        }
        let mut from = a;
        for c in cuts.into_iter().chain(std::iter::once(b)) {
            if c != from {
                subs.push(Sub {
                    from,
                    to: c,
                    sheet: sheet((from[0] + c[0]) / 2.0),
                });
            }
            from = c;
        }
    }
    // A sub-edge along an edge line belongs to either side: it goes with the one before it.
    let on_line = |x: f64| {
        let f = (x + 180.0) / 360.0;
        (f - f.round()).abs() < 1e-12
    };
    let Some(anchor) = (0..subs.len()).find(|&i| !on_line((subs[i].from[0] + subs[i].to[0]) / 2.0))
    else {
        return vec![ring.to_vec()];
    };
    for j in 1..subs.len() {
        let i = (anchor + j) % subs.len();
        if on_line((subs[i].from[0] + subs[i].to[0]) / 2.0) {
            subs[i].sheet = subs[(i + subs.len() - 1) % subs.len()].sheet;
        }
    }
    let count = subs.len();
    // Where the sheet changes on an edge line (for a ring round a pole, the change where its
    // unwrapped offsets come back round is not one).
    let change = (0..count).find(|&i| {
        subs[i].sheet != subs[(i + count - 1) % count].sheet
            && (!round_pole || on_line(subs[i].from[0]))
    });
    // A ring round a pole that starts and ends on the edge (world data sets cut it there) has no
    // change of sheet: it runs from one side of the edge to the other as it is.
    let start = match (change, round_pole) {
        (Some(i), _) => i,
        (None, true) => 0,
        (None, false) => return vec![ring.to_vec()],
    };
    if round_pole {
        // One chain from where the ring meets the edge, round to where it meets it again on the
        // other side, closed down the edge to the pole, along the pole and back up the edge.
        let mut chain: Vec<LonLat> = Vec::with_capacity(count + 1);
        for j in 0..count {
            let sub = &subs[(start + j) % count];
            let shift = 360.0 * sub.sheet as f64;
            let at = |p: LonLat| [lon0 + (p[0] - shift).clamp(-180.0, 180.0), p[1]];
            if j == 0 {
                chain.push(at(sub.from));
            }
            chain.push(at(sub.to));
        }
        let pole = if ring.iter().map(|p| p[1]).sum::<f64>() < 0.0 {
            -90.0
        } else {
            90.0
        };
        let (last, first) = (chain[chain.len() - 1], chain[0]);
        let mut close = Vec::new();
        let down = (pole - last[1]).abs().ceil() as usize;
        for k in 1..=down {
            close.push([last[0], last[1] + (pole - last[1]) * k as f64 / down as f64]);
        }
        let across = (first[0] - last[0]).abs().ceil() as usize;
        for k in 1..across {
            close.push([
                last[0] + (first[0] - last[0]) * k as f64 / across as f64,
                pole,
            ]);
        }
        let up = (first[1] - pole).abs().ceil() as usize;
        for k in 0..up {
            close.push([first[0], pole + (first[1] - pole) * k as f64 / up as f64]);
        }
        chain.extend(close);
        return vec![chain];
    }
    // Walk from a change of sheet: each run of one sheet is a piece from the edge to the edge.
    let mut pieces: Vec<(i64, Vec<LonLat>)> = Vec::new();
    for j in 0..subs.len() {
        let s = &subs[(start + j) % subs.len()];
        match pieces.last_mut() {
            Some((sheet, points)) if *sheet == s.sheet => points.push(s.to),
            _ => pieces.push((s.sheet, vec![s.from, s.to])),
        }
    }
    pieces
        .into_iter()
        .map(|(sheet, points)| {
            // Back to longitudes on this sheet; the ends lie on its edges.
            let shift = 360.0 * sheet as f64;
            let mut out: Vec<LonLat> = points
                .iter()
                .map(|p| [lon0 + (p[0] - shift).clamp(-180.0, 180.0), p[1]])
                .collect();
            // Close along the edge, from the last point back to the first, a degree at a time.
            let (last, first) = (out[out.len() - 1], out[0]);
            let steps = (first[1] - last[1]).abs().ceil() as usize;
            for s in 1..steps {
                let lat = last[1] + (first[1] - last[1]) * s as f64 / steps as f64;
                out.push([last[0], lat]);
            }
            out
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::super::tests::shoelace as area;
    use super::*;

    #[test]
    fn a_box_across_180_degrees_becomes_two_boxes() {
        // 170 E to 170 W (10 degrees each side of the edge), 60 to 70 N.
        let ring = vec![[170.0, 60.0], [-170.0, 60.0], [-170.0, 70.0], [170.0, 70.0]];
        let pieces = split_at_edge(&ring, 0.0);
        assert_eq!(pieces.len(), 2, "{pieces:?}");
        for piece in &pieces {
            let east = piece.iter().all(|p| p[0] >= 170.0 && p[0] <= 180.0);
            let west = piece.iter().all(|p| p[0] >= -180.0 && p[0] <= -170.0);
            assert!(east || west, "{piece:?}");
            // Each is 10 by 10 degrees, with its edge on the map's edge.
            assert!((area(piece).abs() - 100.0).abs() < 1e-9, "{piece:?}");
        }
    }

    #[test]
    fn rings_that_do_not_cross_or_go_round_a_pole_stay_whole() {
        let europe = vec![[-10.0, 40.0], [30.0, 40.0], [30.0, 60.0], [-10.0, 60.0]];
        assert_eq!(split_at_edge(&europe, 0.0), vec![europe.clone()]);
        // Data cut at 180 degrees touches the edge without crossing it.
        let cut = vec![[170.0, 60.0], [180.0, 60.0], [180.0, 70.0], [170.0, 70.0]];
        assert_eq!(split_at_edge(&cut, 0.0), vec![cut.clone()]);
        // Round the south pole, closed along it already: one ring, the cap down to the pole.
        let mut cap: Vec<LonLat> = (0..=360).map(|k| [k as f64 - 180.0, -70.0]).collect();
        cap.push([180.0, -90.0]);
        cap.push([-180.0, -90.0]);
        let pieces = split_at_edge(&cap, 0.0);
        assert_eq!(pieces.len(), 1);
        assert!((area(&pieces[0]).abs() - 360.0 * 20.0).abs() < 1e-6);
        // Round the south pole as world data sets write it, from -180 to 180 with no point at
        // the pole (Natural Earth's Antarctica): closed along the pole.
        let cut: Vec<LonLat> = (0..=360).map(|k| [k as f64 - 180.0, -70.0]).collect();
        let pieces = split_at_edge(&cut, 0.0);
        assert_eq!(pieces.len(), 1);
        assert!(
            (area(&pieces[0]).abs() - 360.0 * 20.0).abs() < 1e-6,
            "{}",
            area(&pieces[0])
        );
        // Or with the jump from 180 back to -180 between two points: closed along the pole too.
        let open: Vec<LonLat> = (0..360).map(|k| [k as f64 - 179.5, -70.0]).collect();
        let pieces = split_at_edge(&open, 0.0);
        assert_eq!(pieces.len(), 1);
        assert!(pieces[0].iter().any(|p| p[1] == -90.0));
        assert!(
            (area(&pieces[0]).abs() - 360.0 * 20.0).abs() < 1e-6,
            "{}",
            area(&pieces[0])
        );
        // Another central meridian moves the edge: the first box crosses 160 W's opposite, 20 E.
        let pieces = split_at_edge(&europe, -160.0);
        assert_eq!(pieces.len(), 2);
        let total: f64 = pieces.iter().map(|p| area(p).abs()).sum();
        assert!((total - 800.0).abs() < 1e-9);
    }
}
