//! ITTC-1957 model–ship correlation line and Reynolds number.
