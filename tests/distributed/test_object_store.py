"""The content-addressed store on an S3-compatible service (moto's server, over HTTP): objects
named by SHA-256, written once, and refused when what was read does not hash to its name."""

from __future__ import annotations

import hashlib
from pathlib import Path
from typing import Any

import pytest

from service.archive.files import Store
from service.archive.objects import ObjectStore, StoreUnavailable, open_store
from service.config import Settings
from service.errors import NotFound


def test_put_names_the_object_by_its_sha256_and_get_reads_it_back(
    s3: Any, s3_endpoint: str, bucket: str
) -> None:
    store = ObjectStore(bucket=bucket, prefix="/round-trip/", endpoint_url=s3_endpoint)
    data = b"%PDF-1.7 a pack's bytes"
    digest = store.put(data)
    assert digest == hashlib.sha256(data).hexdigest()
    # the object is where its name says, read independently of the store
    stored = s3.get_object(Bucket=bucket, Key=f"round-trip/{digest}")["Body"].read()
    assert stored == data
    assert store.get(digest) == data
    assert store.put(data) == digest  # a second put of the same bytes is the same object


def test_put_skips_an_existing_object_and_get_refuses_a_damaged_one(
    s3: Any, s3_endpoint: str, bucket: str
) -> None:
    store = ObjectStore(bucket=bucket, prefix="damaged", endpoint_url=s3_endpoint)
    digest = store.put(b"the original bytes")
    s3.put_object(Bucket=bucket, Key=f"damaged/{digest}", Body=b"bytes changed behind our back")
    assert store.put(b"the original bytes") == digest  # exists: not uploaded again
    with pytest.raises(NotFound, match="is damaged") as caught:
        store.get(digest)
    expected = hashlib.sha256(b"bytes changed behind our back").hexdigest()
    assert expected in caught.value.message


def test_get_of_a_missing_or_malformed_name_is_not_found(
    s3: Any, s3_endpoint: str, bucket: str
) -> None:
    store = ObjectStore(bucket=bucket, prefix="missing", endpoint_url=s3_endpoint)
    absent = hashlib.sha256(b"never stored").hexdigest()
    with pytest.raises(NotFound, match=absent):
        store.get(absent)
    with pytest.raises(NotFound):
        store.get("../../etc/passwd")


def test_a_missing_bucket_says_what_to_do(s3: Any, s3_endpoint: str) -> None:
    store = ObjectStore(bucket="no-such-bucket-here", endpoint_url=s3_endpoint)
    with pytest.raises(StoreUnavailable, match="create the bucket") as caught:
        store.put(b"anything")
    assert caught.value.status == 503
    assert "s3://no-such-bucket-here/" in caught.value.message


def test_open_store_picks_local_files_or_the_object_store(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, s3_endpoint: str, bucket: str
) -> None:
    monkeypatch.delenv("PLUMBLINE_STORE_URL", raising=False)
    local = open_store(Settings(data_dir=tmp_path))
    assert isinstance(local, Store)
    assert local.root == tmp_path / "files"

    monkeypatch.setenv("PLUMBLINE_STORE_URL", f"s3://{bucket}/packs/2026")
    monkeypatch.setenv("PLUMBLINE_S3_ENDPOINT_URL", s3_endpoint)
    remote = open_store(Settings(data_dir=tmp_path))
    assert isinstance(remote, ObjectStore)
    assert (remote.bucket, remote.prefix, remote.endpoint_url) == (
        bucket,
        "packs/2026",
        s3_endpoint,
    )

    monkeypatch.setenv("PLUMBLINE_STORE_URL", "ftp://example.invalid/packs")
    with pytest.raises(StoreUnavailable, match="s3://bucket/prefix"):
        open_store(Settings(data_dir=tmp_path))
