"""Assembling the pack: a reportlab document with chart pages placed as vector form XObjects."""
