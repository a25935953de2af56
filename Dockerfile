FROM python:3.11-slim

ENV PYTHONDONTWRITEBYTECODE=1 \
    PYTHONUNBUFFERED=1 \
    PIP_NO_CACHE_DIR=1 \
    STEPLINE_EXAMPLES_DIR=/app/openapi_examples

WORKDIR /app
COPY pyproject.toml README.md ./
COPY service ./service
COPY openapi_examples ./openapi_examples
RUN pip install . && useradd --create-home --uid 10001 stepline

USER stepline
EXPOSE 8000
HEALTHCHECK --interval=30s --timeout=3s --start-period=5s --retries=3 \
    CMD python -c "import urllib.request, sys; sys.exit(urllib.request.urlopen('http://127.0.0.1:8000/v1/health', timeout=2).status != 200)"
CMD ["uvicorn", "service.app:app", "--host", "0.0.0.0", "--port", "8000", "--timeout-graceful-shutdown", "20", "--timeout-keep-alive", "75"]
