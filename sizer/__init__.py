"""sizer: internal forces, stresses, allowable-stress checks and sizing of one straight member."""

__version__ = "0.1.0"
