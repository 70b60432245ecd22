"""[materials.NAME] tables (member and catalogue files) to `model.Material`: moduli, density, yield
strength and the allowable stresses the user takes from the governing code (Pa).
"""

from __future__ import annotations

from sizer.inputfile.reader import Reader
from sizer.model import Allowables, Material

MATERIAL_KEYS = {"elastic_modulus", "shear_modulus", "poisson_ratio", "density", "yield_strength", "allowable"}


ALLOWABLE_KEYS = ("tension", "compression", "bending", "shear", "equivalent")


def parse_material(name: str, table: dict, reader: Reader, prefix: str) -> Material:
    """A [materials.NAME] table (member or catalogue file) to a Material. Needs E, density and G or
    Poisson's ratio; allowables optional (a check whose allowable is missing is reported as not made)."""
    reader.known_keys(table, MATERIAL_KEYS, prefix)
    modulus = reader.required_quantity(table, "elastic_modulus", "modulus", prefix, 'give e.g. elastic_modulus = "200 GPa"')
    density = reader.required_quantity(table, "density", "density", prefix, 'give e.g. density = "7850 kg/m^3"')
    if "shear_modulus" in table and "poisson_ratio" in table:
        raise reader.error(f"{prefix}.poisson_ratio", "give shear_modulus or poisson_ratio, not both", "remove one")
    if "shear_modulus" in table:
        shear = reader.quantity(table, "shear_modulus", "modulus", prefix)
    elif "poisson_ratio" in table:
        nu = reader.number(table["poisson_ratio"], f"{prefix}.poisson_ratio", positive=False)
        if not 0 <= nu < 0.5:
            raise reader.error(f"{prefix}.poisson_ratio", f"{nu} is outside 0 to 0.5", "give e.g. poisson_ratio = 0.3")
        shear = modulus / (2 * (1 + nu))
    else:
        raise reader.error(f"{prefix}.shear_modulus", "shear_modulus is missing", 'give e.g. shear_modulus = "77 GPa" or poisson_ratio = 0.3')
    yield_strength = reader.quantity(table, "yield_strength", "stress", prefix)
    for key, number in (("elastic_modulus", modulus), ("shear_modulus", shear), ("density", density), ("yield_strength", yield_strength)):
        if number is not None and number <= 0:
            raise reader.error(f"{prefix}.{key}", "must be greater than zero", "give a positive value")
    allowable_table = reader.table(table.get("allowable", {}), f"{prefix}.allowable")
    reader.known_keys(allowable_table, ALLOWABLE_KEYS, f"{prefix}.allowable")
    allowables = {}
    for key in ALLOWABLE_KEYS:
        allowables[key] = reader.quantity(allowable_table, key, "stress", f"{prefix}.allowable")
        if allowables[key] is not None and allowables[key] <= 0:
            raise reader.error(f"{prefix}.allowable.{key}", "an allowable stress must be greater than zero", 'give e.g. "165 MPa"')
    return Material(name=name, elastic_modulus=modulus, shear_modulus=shear, density=density,
                    yield_strength=yield_strength, allowable=Allowables(**allowables), source=reader.file)
