"""The benchmark against the plain-library floor (``make bench``) and the profile of the pipeline.

``generate`` makes the packs, ``floor`` is the hand-written script Plumbline replaces, ``run``
measures both in fresh processes and writes ``results.json``, ``ratios.png`` and the profiles.
"""
