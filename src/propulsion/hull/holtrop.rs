//! Holtrop & Mennen (1982) and Holtrop (1984) resistance method.
