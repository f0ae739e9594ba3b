"""Drawing a laid-out figure: style, text from the shipped font, SVG, and PNG/PDF/molfile export."""
