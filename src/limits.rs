//! Every limit the tool puts on its input and its work, in one place and each
//! with its reason: a request beyond one is refused with a message that
//! names it, never truncated silently.

// What users may write.

/// Longest accepted source text, in bytes.
pub const MAX_SOURCE_BYTES: usize = 1 << 20;

/// Deepest accepted nesting of `(` and `[`.
pub const MAX_NESTING: usize = 64;

/// Deepest accepted tree (a sum of n terms is n deep); evaluators may
/// recurse this far.
pub const MAX_TREE_DEPTH: usize = 2000;

/// Most digits in one number literal.
pub const MAX_LITERAL_DIGITS: usize = 5000;

/// Largest |exponent| of a decimal literal (`1e400` is fine, `1e99999` is
/// almost certainly a mangled paste and would cost a huge integer).
pub const MAX_EXPONENT: u32 = 1000;

/// Largest argument of a zeta value.
pub const MAX_ZETA_ARGUMENT: u32 = 1000;

/// Largest depth of a multiple zeta value, in the language and in the
/// evaluator (the iterated integral grows with the depth).
pub const MAX_ZETA_DEPTH: usize = 8;

/// How many catalogue definitions may stand inside one another (`a` defined
/// through `b` defined through ...); far above any real catalogue, low
/// enough to stop a cycle of user entries at once.
pub const MAX_NAME_DEPTH: usize = 16;

// Series files.

/// Largest accepted series file, in bytes.
pub const MAX_FILE_BYTES: usize = 16 << 20;

/// Deepest nesting of YAML collections accepted. A series file needs three
/// levels (the file, `orders`, an entry); `about` may nest a few more. The
/// YAML parser's cost grows quadratically with the depth of flow
/// collections, so a pathological file is refused before it is parsed.
pub const MAX_YAML_DEPTH: usize = 64;

/// Highest loop order a file may give.
pub const MAX_FILE_LOOP: u32 = 200;

/// The highest power of a log a numerical coefficient may reach; far beyond
/// any bootstrap output (degree 2L), and it keeps products from overflowing.
pub const MAX_LOG_POWER: u32 = 1 << 16;

// The exact engine.

/// The largest loop order the exact engine accepts: 50 loops of Gamma take
/// about 30 s and 1.5 GiB on two cores, and the cost grows about 2.6-fold
/// every four loops (DEVELOPERS.md, cost model); the packed monomial keys
/// hold weights up to 100, which is where Delta at 50 loops ends.
pub const MAX_LOOPS: u32 = 50;

// Numbers.

/// The most digits `eval` and `expand` print: far beyond any table, and
/// still a fraction of a second of MPFR work.
pub const MAX_PRINTED_DIGITS: u32 = 10_000;

/// The most working digits of the numerical comparisons of `check` and
/// `origin`.
pub const MAX_CHECK_DIGITS: u32 = 2000;

/// Largest number of significant digits `evaluate` accepts.
pub const MAX_FINITE_DIGITS: u32 = 200;

/// Coupling beyond which the truncation and node counts become impractical.
pub const MAX_COUPLING: f64 = 200.0;

/// Largest truncation N of the kernel the finite-coupling engine will try:
/// the N x N system in MPFR costs N^3, and one factorisation at N = 3000
/// takes minutes; a request that needs more (Delta at large g, where N grows
/// like g) is refused with a message instead of running for hours.
pub const MAX_TRUNCATION: usize = 3000;

/// Largest weight s1 + ... + sk accepted.
pub const MAX_MZV_WEIGHT: u32 = 200;

/// Largest precision in bits accepted.
pub const MAX_MZV_PREC: u32 = 40_000;

// Grids of couplings.

/// The most couplings `at` and `scan` take in one run.
pub const MAX_POINTS: usize = 100_000;

/// The most points along a plot's range: more add nothing a figure can show.
pub const MAX_PLOT_POINTS: usize = 2_000;

// Numerical identification.

/// Highest weight of `identify --weight`: through weight 11 the basis of
/// multiple zeta values is stated in `quantity::identify` and its size
/// matches the dimension conjecture; weight 12 needs a depth-4 element this
/// tool does not state.
pub const MAX_IDENTIFY_WEIGHT: u32 = 11;

/// Most basis elements of one identification: PSLQ costs about n^3 operations
/// per iteration and needs about n digits per digit of coefficient size, so
/// 60 elements already want hundreds of digits.
pub const MAX_IDENTIFY_BASIS: usize = 60;

/// Most trusted digits of one identification: far beyond published values,
/// and a search at that precision with a large basis still takes seconds.
pub const MAX_IDENTIFY_DIGITS: u32 = 2000;
