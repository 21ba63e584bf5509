//! Benchmark of the six-gluon origin workflow (run with `cargo bench --bench
//! origin`): a ten-loop series of E at the origin, polynomials of degree up to
//! 20 in three logs, built as the exponential of the predicted quadratic form
//! (Gamma_oct and Gamma_hex from the exact kernel engine) with a constant C0
//! made of kernel functionals; then the logarithm, the exponentiation check
//! and the readings, and an exact fit of the constants. Then the same through
//! the functions `loopwise origin` and `loopwise fit` call: the series file
//! as text, read, checked against the predictions, reported, and the
//! constants fitted from a file.

use std::time::Instant;

use loopwise::exact::powerseries::Series;
use loopwise::exact::ring::Exact;
use loopwise::exact::ring::{EvenStyle, Notation};
use loopwise::fit::file::fit_file;
use loopwise::fit::{default_basis, fit, Solution};
use loopwise::input::catalogue::Catalogue;
use loopwise::input::seriesfile::parse_series_text;
use loopwise::origin::check::check_origin;
use loopwise::origin::read::parse_origin_text;
use loopwise::origin::{analyse_e, predicted_log_coefficients, r6_to_e, OriginLogs};
use loopwise::quantity::Quantity;
use loopwise::report::{fit as fit_report, origin as origin_report, DataFormat};

const LOOPS: u32 = 10;

fn expand(formula: &str) -> Series {
    let catalogue = Catalogue::builtin().expect("built-in catalogue");
    Quantity::resolve(formula, &catalogue)
        .expect("formula")
        .expand(LOOPS, &mut |_, _, _| {})
        .expect("expansion")
}

fn main() {
    let logs = OriginLogs::three();
    let l = |i: usize| Exact::symbol(&format!("l{i}"));
    let sum_squared = (&(&l(1) + &l(2)) + &l(3)).pow(2);
    let differences = {
        let d = |a: usize, b: usize| (&l(a) - &l(b)).pow(2);
        &(&d(1, 2) + &d(2, 3)) + &d(3, 1)
    };

    let t = Instant::now();
    let p = predicted_log_coefficients(LOOPS).expect("predictions");
    let c0 =
        expand("-zeta(2)/2*Gamma(pi/4) + (Delta(pi/4) + Delta(pi/3) - Delta(pi/6) - Delta(0))/4");
    let cusp = expand("Gamma(pi/4)");
    let ln_e = Series::new(
        (0..=LOOPS as usize)
            .map(|k| {
                &(&(p.octagon.coeff(k) * &sum_squared) + &(p.hexagon.coeff(k) * &differences))
                    + c0.coeff(k)
            })
            .collect(),
    );
    let e1 = loopwise::origin::one_loop_limit(&logs).scale(&rug::Rational::from((1, 4)));
    let r6 = &ln_e - &cusp.map(|c| c * &e1);
    let e = r6_to_e(&r6, &cusp, &logs).expect("E");
    let terms: usize = e.coeffs().iter().map(Exact::len).sum();
    println!(
        "data: E through {LOOPS} loops, {terms} terms in all ({} at g^{}), built in {:.3} s",
        e.coeff(LOOPS as usize).len(),
        2 * LOOPS,
        t.elapsed().as_secs_f64()
    );

    let t = Instant::now();
    let a = analyse_e(&e, &logs).expect("analysis");
    let t_analyse = t.elapsed();
    assert!(a.broken.is_none() && a.orders.len() == LOOPS as usize);
    println!(
        "logarithm, exponentiation check and readings: {:.3} s",
        t_analyse.as_secs_f64()
    );

    let catalogue = Catalogue::builtin().expect("built-in catalogue");
    let constants: Vec<(u32, Exact)> = a
        .orders
        .iter()
        .map(|r| (r.order as u32, r.constant.clone()))
        .collect();
    let t = Instant::now();
    let f = fit(&constants, &default_basis(), LOOPS, &catalogue).expect("fit");
    let t_fit = t.elapsed();
    let kind = match &f.solution {
        Solution::Unique(_) => "unique".to_string(),
        Solution::Family { null_space, .. } => format!("family, {} free", null_space.len()),
        Solution::Inconsistent(_) => "no fit".to_string(),
    };
    if let Solution::Unique(a) = &f.solution {
        let expected = [
            ("zeta(2)*Gamma(pi/4)", (-1, 2)),
            ("Delta(pi/4)", (1, 4)),
            ("Delta(pi/3)", (1, 4)),
            ("Delta(pi/6)", (-1, 4)),
            ("Delta(0)", (-1, 4)),
        ];
        for (name, x) in f.names.iter().zip(a) {
            let want = expected
                .iter()
                .find(|(n, _)| n == name)
                .map_or(rug::Rational::new(), |(_, v)| rug::Rational::from(*v));
            assert_eq!(*x, want, "{name}");
        }
    }
    println!(
        "fit of C0 through {LOOPS} loops, default basis ({} elements): {kind}, {:.3} s",
        f.names.len(),
        t_fit.as_secs_f64()
    );
    println!(
        "total, analysis and fit: {:.3} s",
        (t_analyse + t_fit).as_secs_f64()
    );

    let t = Instant::now();
    let f = fit(&constants[..2], &default_basis(), 16, &catalogue).expect("fit");
    let free = match &f.solution {
        Solution::Family { null_space, .. } => null_space.len(),
        _ => 0,
    };
    println!("fit of C0 through 2 loops: {free} free parameters, fixed by {:?} (basis to 16 loops), {:.3} s", f.fixing, t.elapsed().as_secs_f64());

    pipeline(&e, &constants);
}

/// The whole `origin` command on a ten-loop file, then `fit` on its constants.
fn pipeline(e: &Series, constants: &[(u32, Exact)]) {
    let mut text = "normalisation: E\ncoupling: g2\nsymbols: [l1, l2, l3]\norders:\n".to_string();
    for k in 1..=e.order() {
        text.push_str(&format!(
            "  - loop: {k}\n    exact: \"{}\"\n",
            e.coeff(k).format(EvenStyle::Zeta, Notation::Text)
        ));
    }
    let mut fit_text = "coupling: g2\norders:\n".to_string();
    for (k, c) in constants {
        fit_text.push_str(&format!(
            "  - loop: {k}\n    exact: \"{}\"\n",
            c.format(EvenStyle::Zeta, Notation::Text)
        ));
    }
    let catalogue = Catalogue::builtin().expect("built-in catalogue");

    let t = Instant::now();
    let data = parse_origin_text(&text, "ten-loops.yaml").expect("origin file");
    let t_read = t.elapsed();
    let c = check_origin(&data, &catalogue, 30).expect("origin check");
    let report = origin_report::render(&c, DataFormat::Text, EvenStyle::Zeta).expect("report");
    let t_origin = t.elapsed();
    assert!(c.agrees(), "{report}");
    let file = parse_series_text(&fit_text, "ten-loop-constants.yaml").expect("fit file");
    let r = fit_file(&file, default_basis(), LOOPS, &catalogue).expect("fit");
    let _ = fit_report::render(&r, DataFormat::Text).expect("fit report");
    let t_total = t.elapsed();
    assert!(matches!(r.fit.solution, Solution::Unique(_)));
    println!(
        "pipeline: `origin` on a {} kB ten-loop file {:.3} s (reading {:.3} s), then `fit` of its constants {:.3} s; total {:.3} s",
        text.len() / 1024,
        t_origin.as_secs_f64(),
        t_read.as_secs_f64(),
        (t_total - t_origin).as_secs_f64(),
        t_total.as_secs_f64()
    );
}
