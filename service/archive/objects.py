"""The content-addressed store on an S3-compatible object service, for more than one machine.

Same contract as :class:`service.archive.files.Store`: ``put(bytes) -> sha256`` and
``get(sha256) -> bytes``. An object is named by the SHA-256 of its bytes under the configured
prefix, so it is written once: ``put`` skips an object that is there already (and uploads with
``If-None-Match: *``, so two writers racing cannot replace each other). ``get`` hashes what it
read and refuses bytes that do not match their name, so a damaged object is never served as a
pack. Credentials come from the usual AWS environment (variables, shared files, instance role).

``open_store(settings)`` picks the local file store or this one from ``PLUMBLINE_STORE_URL``.
"""

from __future__ import annotations

import base64
import hashlib
import logging
import os
from pathlib import Path
from typing import Any
from urllib.parse import urlsplit

from service import logs
from service.archive.files import BlobStore, Store
from service.config import Settings
from service.errors import NotFound, PlumblineError

_HEX = frozenset("0123456789abcdef")
_MISSING = {"404", "NoSuchKey", "NotFound"}
_ALREADY_THERE = {"PreconditionFailed", "ConditionalRequestConflict"}


log = logging.getLogger("plumbline.store")


class StoreUnavailable(PlumblineError):
    """The object store cannot be reached or used (no bucket, refused credentials, no endpoint)."""

    code = "store_unavailable"
    status = 503


class ObjectStore:
    """Blobs in ``bucket`` under ``prefix/<sha256>``, through boto3's S3 client."""

    def __init__(
        self, *, bucket: str, prefix: str = "", endpoint_url: str | None = None, client: Any = None
    ) -> None:
        self.bucket = bucket
        self.prefix = prefix.strip("/")
        self.endpoint_url = endpoint_url
        self._client = client if client is not None else _client(endpoint_url)

    def key(self, digest: str) -> str:
        if len(digest) != 64 or not set(digest) <= _HEX:
            raise NotFound(f"no stored file {digest!r}")
        return f"{self.prefix}/{digest}" if self.prefix else digest

    def put(self, data: bytes) -> str:
        digest = hashlib.sha256(data).hexdigest()
        key = self.key(digest)
        if self._exists(key):
            return digest
        upload = {
            "Bucket": self.bucket,
            "Key": key,
            "Body": data,
            # the service refuses a body damaged on the way
            "ChecksumSHA256": base64.b64encode(bytes.fromhex(digest)).decode(),
        }
        try:
            self._client.put_object(**upload, IfNoneMatch="*")
        except Exception as exc:  # botocore's errors are translated here
            code = _code(exc)
            if code in _ALREADY_THERE:  # another writer stored the same bytes first
                return digest
            if code != "NotImplemented":
                raise self._unavailable("store", key, exc) from exc
            # a service without conditional writes: the same name always holds the same bytes
            try:
                self._client.put_object(**upload)
            except Exception as again:  # botocore's errors are translated here
                raise self._unavailable("store", key, again) from again
        return digest

    def get(self, digest: str) -> bytes:
        key = self.key(digest)
        try:
            answer = self._client.get_object(Bucket=self.bucket, Key=key)
            data: bytes = answer["Body"].read()
        except Exception as exc:  # botocore's errors are translated here
            if _code(exc) in _MISSING:
                raise NotFound(f"no stored file {digest}") from None
            raise self._unavailable("read", key, exc) from exc
        found = hashlib.sha256(data).hexdigest()
        if found != digest:
            raise NotFound(
                f"the stored file {digest} is damaged: the object s3://{self.bucket}/{key} "
                f"hashes to {found}; restore it from a backup of the bucket"
            )
        return data

    def discard(self, digest: str) -> None:
        key = self.key(digest)
        try:
            self._client.delete_object(Bucket=self.bucket, Key=key)
        except Exception as exc:  # botocore's errors are translated here
            if _code(exc) not in _MISSING:
                raise self._unavailable("remove", key, exc) from exc

    def _exists(self, key: str) -> bool:
        try:
            self._client.head_object(Bucket=self.bucket, Key=key)
        except Exception as exc:  # botocore's errors are translated here
            if _code(exc) in _MISSING:
                return False
            raise self._unavailable("check", key, exc) from exc
        return True

    def _unavailable(self, action: str, key: str, exc: Exception) -> StoreUnavailable:
        where = f"s3://{self.bucket}/{key}"
        if self.endpoint_url:
            where += f" at {self.endpoint_url}"
        code = _code(exc)
        if code == "NoSuchBucket":
            hint = "create the bucket, or correct PLUMBLINE_STORE_URL"
        elif code in {"AccessDenied", "InvalidAccessKeyId", "SignatureDoesNotMatch"}:
            hint = "check the AWS credentials in the environment and the bucket's policy"
        else:
            hint = "check PLUMBLINE_S3_ENDPOINT_URL and that the object store is running"
        incident = logs.incident(log, f"could not {action} {where}", exc=exc)
        return StoreUnavailable(
            f"could not {action} {where} (incident {incident}); {hint}", incident=incident
        )


def _code(exc: Exception) -> str:
    """botocore's error code of a service answer, or '' for a connection fault."""
    response = getattr(exc, "response", None)
    if not isinstance(response, dict):
        return ""
    return str(response.get("Error", {}).get("Code", ""))


def _client(endpoint_url: str | None) -> Any:
    import boto3  # type: ignore[import-untyped]  # only a deployment with an object store needs it
    from botocore.config import Config  # type: ignore[import-untyped]

    config = Config(retries={"max_attempts": 5, "mode": "standard"}, connect_timeout=10)
    region = os.environ.get("AWS_REGION") or os.environ.get("AWS_DEFAULT_REGION") or "us-east-1"
    return boto3.client("s3", endpoint_url=endpoint_url, region_name=region, config=config)


def open_store(settings: Settings) -> Store | ObjectStore:
    """The store ``PLUMBLINE_STORE_URL`` names: unset, the files under the data folder;
    ``s3://bucket/prefix``, an S3-compatible service (``PLUMBLINE_S3_ENDPOINT_URL`` for one that
    is not AWS); ``file:///path``, files under that folder."""
    url = str(getattr(settings, "store_url", None) or os.environ.get("PLUMBLINE_STORE_URL", ""))
    endpoint = getattr(settings, "s3_endpoint_url", None) or os.environ.get(
        "PLUMBLINE_S3_ENDPOINT_URL"
    )
    if not url:
        return Store(settings.store_dir)
    parts = urlsplit(url)
    if parts.scheme == "s3" and parts.netloc:
        return ObjectStore(bucket=parts.netloc, prefix=parts.path, endpoint_url=endpoint or None)
    if parts.scheme == "file" and parts.path:
        return Store(Path(parts.path))
    raise StoreUnavailable(
        f"PLUMBLINE_STORE_URL {url!r} is not a store this service knows; use "
        "s3://bucket/prefix for an S3-compatible object store, file:///folder for local files, "
        "or leave it unset for files under the data folder"
    )


__all__ = ["BlobStore", "ObjectStore", "StoreUnavailable", "open_store"]
