//! Cavitation and blade loading checks: Keller, Burrill, blade loading and tip speed.
