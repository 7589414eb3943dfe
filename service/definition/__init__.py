"""The report definition: its shape (``model``), and validation that reports every problem at once."""
