"""The catalogue files shipped with sizer (package data: found with importlib.resources)."""
