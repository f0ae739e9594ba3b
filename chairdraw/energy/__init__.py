"""Conformational energies of the two chairs: tables, interaction terms, equilibrium."""
