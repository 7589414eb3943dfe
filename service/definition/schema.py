"""The published JSON Schema of report definitions."""

from __future__ import annotations

from typing import Any

from service.definition.model import VERSION, ReportDefinition


def definition_schema() -> dict[str, Any]:
    schema = ReportDefinition.model_json_schema()
    schema["$schema"] = "https://json-schema.org/draft/2020-12/schema"
    schema["$id"] = f"https://plumbline.invalid/schema/report-definition-v{VERSION}.json"
    schema["title"] = f"Plumbline report definition, version {VERSION}"
    return schema
