//! Line charts (energy curves, profiles) drawn with plotters on our canvas.
