//! Tests of the 3-D picture: views, framing, and rendered pixels.

mod demo;
mod framing;
mod helpers;
mod perspective;
mod pictures;
mod views;
