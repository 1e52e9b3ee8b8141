#!/usr/bin/env python3
"""Checks with Python's standard http.client, which writes a whole request body before it reads
the answer, that a running Pendula server's upload refusals are readable (status and JSON body)
instead of a dropped connection. Run against your own product instance:

    python3 ingest-server/bench/refusal-client-check.py http://127.0.0.1:PORT [EMAIL PASSWORD]

Without credentials it checks the 401 of an unauthenticated 20 MB upload; with a patient's
credentials it also checks the 413 of a 150 MB file. Prints one line per case; exit 1 on a miss.
"""
import http.client
import json
import sys
import urllib.parse

BOUNDARY = "----pendula-refusal-check"


def multipart(size):
    head = (
        f"--{BOUNDARY}\r\nContent-Disposition: form-data; name=\"files\"; filename=\"walk.csv\"\r\n"
        "Content-Type: text/csv\r\n\r\n"
    ).encode()
    tail = f"\r\n--{BOUNDARY}--\r\n".encode()
    return head + b"0.01,0.1,9.8,0.1,1.0,2.0,3.0\n" * (size // 29) + tail


def post(url, path, body, headers):
    conn = http.client.HTTPConnection(url.hostname, url.port, timeout=300)
    try:
        conn.request("POST", path, body=body, headers=headers)
        res = conn.getresponse()
        return res.status, res.getheader("Connection"), res.read().decode("utf-8", "replace")
    except OSError as err:
        return 0, None, f"{type(err).__name__}: {err}"
    finally:
        conn.close()


def main():
    url = urllib.parse.urlparse(sys.argv[1])
    cases = [("no token, 20 MB", 401, multipart(20_000_000), {})]
    if len(sys.argv) >= 4:
        status, _, text = post(url, "/api/auth/login", json.dumps({"email": sys.argv[2], "password": sys.argv[3]}), {"Content-Type": "application/json"})
        if status != 200:
            print(f"sign-in failed: {status} {text[:200]}")
            return 1
        token = json.loads(text)["accessToken"]
        cases.append(("one 150 MB file", 413, multipart(150_000_000), {"Authorization": f"Bearer {token}"}))
    misses = 0
    for label, expected, body, headers in cases:
        headers = {**headers, "Content-Type": f"multipart/form-data; boundary={BOUNDARY}"}
        status, connection, text = post(url, "/api/sessions", body, headers)
        ok = status == expected
        misses += 0 if ok else 1
        print(f"{'ok  ' if ok else 'MISS'} {label}: {status or 'no status'} (Connection: {connection}) {text[:160]}")
    return 1 if misses else 0


if __name__ == "__main__":
    sys.exit(main())
