//! PDF and SVG writers that translate layout pages item by item.
