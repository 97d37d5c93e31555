//! Element colours for ball-and-stick pictures. The hues follow the trade's broad
//! convention (hydrogen white, carbon dark grey, nitrogen blue, oxygen red, halogens
//! green, sulfur yellow, phosphorus orange); the RGB values are our own, chosen so
//! that every atom stays distinct from the white background under shading (hydrogen
//! is a light grey-white) and from the orbital phase colours (orange and purple).

/// sRGB colour of an element's sphere, by atomic number; elements without an entry
/// (and ghost centres) get a neutral pinkish grey.
pub fn element_rgb(atomic_number: u32) -> [u8; 3] {
    match atomic_number {
        1 => [236, 236, 232],
        2 => [200, 236, 240],
        3 | 11 | 19 => [166, 120, 220],
        4 | 12 | 20 => [150, 190, 110],
        5 => [232, 170, 150],
        6 => [88, 88, 92],
        7 => [58, 92, 214],
        8 => [214, 44, 36],
        9 | 17 => [92, 196, 80],
        10 | 18 => [150, 210, 226],
        13 => [176, 160, 168],
        14 => [200, 176, 132],
        15 => [236, 136, 20],
        16 => [226, 204, 48],
        35 => [150, 40, 30],
        53 => [120, 40, 140],
        _ => [196, 150, 170],
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The hue convention (common practice): the checks name the dominant channel.
    #[test]
    fn conventional_hues() {
        let [r, g, b] = element_rgb(1);
        assert!(r > 220 && g > 220 && b > 220, "hydrogen is near white");
        let [r, g, b] = element_rgb(6);
        assert!(
            r < 110 && r.abs_diff(g) < 8 && r.abs_diff(b) < 8,
            "carbon is dark grey"
        );
        let [r, g, b] = element_rgb(7);
        assert!(b > 2 * r.max(g) && b > 180, "nitrogen is blue");
        let [r, g, b] = element_rgb(8);
        assert!(r > 3 * g.max(b), "oxygen is red");
    }
}
