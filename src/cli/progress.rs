//! Progress on stderr for long runs: shown only on a terminal and only once a
//! run has taken long enough to be worth watching, so pipelines and logs stay clean.

use std::io::{IsTerminal, Write};
use std::time::{Duration, Instant};

pub struct Progress {
    start: Instant,
    shown: bool,
    enabled: bool,
}

impl Progress {
    pub fn new() -> Self {
        Progress {
            start: Instant::now(),
            shown: false,
            enabled: std::io::stderr().is_terminal(),
        }
    }

    /// Reports `done` of `total` steps of `what`.
    pub fn update(&mut self, what: &str, done: usize, total: usize) {
        if !self.enabled || self.start.elapsed() < Duration::from_millis(400) {
            return;
        }
        self.shown = true;
        let mut err = std::io::stderr().lock();
        let width = 30;
        let filled = (done * width)
            .checked_div(total)
            .unwrap_or(width)
            .min(width);
        let _ = write!(
            err,
            "\r{what} [{}{}] {done}/{total} ",
            "#".repeat(filled),
            ".".repeat(width - filled)
        );
        let _ = err.flush();
    }

    /// Clears the progress line, if one was drawn.
    pub fn finish(&mut self) {
        if self.shown {
            let _ = write!(std::io::stderr(), "\r{}\r", " ".repeat(79));
            self.shown = false;
        }
    }
}
