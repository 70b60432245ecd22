"""The steel the tests use: E 200 GPa, G 77 GPa, 7850 kg/m^3 (docs/references.md, common practice);
allowables from the 1989 AISC allowable-stress practice for Fy = 250 MPa (docs/references.md, from
memory): 0.60 Fy tension and compression, 0.66 Fy bending, 0.40 Fy shear; equivalent our choice."""

STEEL_TOML = """
[materials.steel]
elastic_modulus = "200 GPa"
shear_modulus = "77 GPa"
density = "7850 kg/m^3"
yield_strength = "250 MPa"
[materials.steel.allowable]
tension = "150 MPa"
compression = "150 MPa"
bending = "165 MPa"
shear = "100 MPa"
equivalent = "170 MPa"
"""
