//! Cutting polylines at the frame of a figure, so that nothing is drawn
//! outside it and no curve can widen its range: each segment is clipped to
//! the frame (Liang–Barsky), and a curve that leaves the frame goes on as
//! a new piece where it comes back.

/// A rectangle in figure coordinates (y grows downwards, as in SVG).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Frame {
    pub left: f64,
    pub top: f64,
    pub right: f64,
    pub bottom: f64,
}

impl Frame {
    pub fn contains(&self, (x, y): (f64, f64)) -> bool {
        // A hair of tolerance for the rounding of clipped end points.
        let eps = 1e-9 * (self.right - self.left + self.bottom - self.top);
        x >= self.left - eps
            && x <= self.right + eps
            && y >= self.top - eps
            && y <= self.bottom + eps
    }
}

/// The part of the segment a-b inside the frame, if any.
fn segment(frame: &Frame, a: (f64, f64), b: (f64, f64)) -> Option<((f64, f64), (f64, f64))> {
    let (dx, dy) = (b.0 - a.0, b.1 - a.1);
    let (mut t0, mut t1) = (0.0f64, 1.0f64);
    for (p, q) in [
        (-dx, a.0 - frame.left),
        (dx, frame.right - a.0),
        (-dy, a.1 - frame.top),
        (dy, frame.bottom - a.1),
    ] {
        if p == 0.0 {
            if q < 0.0 {
                return None;
            }
        } else {
            let r = q / p;
            if p < 0.0 {
                t0 = t0.max(r);
            } else {
                t1 = t1.min(r);
            }
        }
    }
    if t0 > t1 {
        return None;
    }
    // Uncut ends stay exactly the given points, so that consecutive
    // segments join into one piece.
    let at = |t: f64| {
        if t == 0.0 {
            return a;
        }
        if t == 1.0 {
            return b;
        }
        (
            (a.0 + t * dx).clamp(frame.left, frame.right),
            (a.1 + t * dy).clamp(frame.top, frame.bottom),
        )
    };
    Some((at(t0), at(t1)))
}

/// The visible pieces of a polyline. Points with a non-finite coordinate
/// break the line; so does a step from above the frame to below it (or back)
/// between two samples, which is a pole (of a Padé approximant) or a jump,
/// not a curve the samples resolve.
pub fn polyline(frame: &Frame, points: &[(f64, f64)]) -> Vec<Vec<(f64, f64)>> {
    let mut pieces: Vec<Vec<(f64, f64)>> = Vec::new();
    let mut open = false;
    for w in points.windows(2) {
        let (a, b) = (w[0], w[1]);
        let finite = a.0.is_finite() && a.1.is_finite() && b.0.is_finite() && b.1.is_finite();
        let jumps =
            (a.1 < frame.top && b.1 > frame.bottom) || (a.1 > frame.bottom && b.1 < frame.top);
        let Some((p, q)) = (if finite && !jumps {
            segment(frame, a, b)
        } else {
            None
        }) else {
            open = false;
            continue;
        };
        match pieces.last_mut() {
            Some(piece) if open && piece.last() == Some(&p) => piece.push(q),
            _ => pieces.push(vec![p, q]),
        }
        // The piece goes on only where the segment ended inside (not cut).
        open = q == b;
    }
    pieces
}

#[cfg(test)]
mod tests {
    use super::*;

    const F: Frame = Frame {
        left: 0.0,
        top: 0.0,
        right: 10.0,
        bottom: 10.0,
    };

    #[test]
    fn inside_lines_are_kept_whole() {
        let pts = [(1.0, 1.0), (2.0, 3.0), (4.0, 5.0)];
        assert_eq!(polyline(&F, &pts), vec![pts.to_vec()]);
    }

    #[test]
    fn a_line_leaving_and_coming_back_is_cut_at_the_frame() {
        // Up through the top edge at x = 2, back down through it at x = 6.
        let pts = [(0.0, 2.0), (4.0, -2.0), (8.0, 2.0)];
        let pieces = polyline(&F, &pts);
        assert_eq!(
            pieces,
            vec![vec![(0.0, 2.0), (2.0, 0.0)], vec![(6.0, 0.0), (8.0, 2.0)]]
        );
        for p in pieces.iter().flatten() {
            assert!(F.contains(*p));
        }
    }

    #[test]
    fn poles_and_gaps_break_the_line() {
        let pts = [
            (1.0, 5.0),
            (2.0, -1e9),
            (3.0, 1e9),
            (4.0, 5.0),
            (5.0, f64::NAN),
            (6.0, 5.0),
            (7.0, 6.0),
        ];
        let pieces = polyline(&F, &pts);
        assert_eq!(pieces.len(), 3, "{pieces:?}");
        assert!(pieces.iter().flatten().all(|p| F.contains(*p)));
        assert_eq!(pieces[2], vec![(6.0, 5.0), (7.0, 6.0)]);
    }

    #[test]
    fn a_line_wholly_outside_draws_nothing() {
        assert!(polyline(&F, &[(1.0, 20.0), (5.0, 30.0)]).is_empty());
        assert!(polyline(&F, &[(-5.0, 5.0), (-1.0, 5.0)]).is_empty());
    }
}
