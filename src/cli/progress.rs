//! Progress on standard error for long jobs. Drawn only when standard error is a
//! terminal (indicatif hides it otherwise), so piped output and tests stay clean.

use std::time::Duration;

use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};

/// A spinner with elapsed time, ticking by itself until finished.
pub fn spinner(message: &str) -> ProgressBar {
    let bar = ProgressBar::with_draw_target(None, ProgressDrawTarget::stderr());
    if let Ok(style) = ProgressStyle::with_template("{spinner} {msg} ({elapsed})") {
        bar.set_style(style);
    }
    bar.set_message(message.to_string());
    bar.enable_steady_tick(Duration::from_millis(200));
    bar
}
