"""Plumbline: report packs whose charts do not mislead.

The package is one pipeline with a workflow and storage around it; data flows one way:

    definition -> data -> intents (encoders) -> checks -> render -> assemble
                                       api -> workflow -> archive

Each stage imports only stages to its left (and shared models); nothing imports ``api``.
"""

__version__ = "0.1.0"

#: Bumped whenever a change to drawing or layout changes output bytes for the same input.
STYLE_VERSION = "7"
